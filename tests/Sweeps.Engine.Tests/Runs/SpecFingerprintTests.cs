using Sweeps.Engine.Config;
using Sweeps.Engine.Runs;

namespace Sweeps.Engine.Tests.Runs;

/// <summary>
/// The spec fingerprint is stored in every run directory and decides whether a run may be resumed or diffed as the same
/// spec, so it must not change between versions: these values were computed by the earlier implementation (JSON text from
/// the serialiser with fresh options, then SHA-256) and pinned here.
/// </summary>
public sealed class SpecFingerprintTests
{
    private const string Map = """
        [model]
        kind = "map"
        variables = ["x"]
        parameters = ["r"]

        [model.equations]
        x = "r*x*(1 - x)"

        [initial]
        x = 0.3

        [grid]
        r = { from = 2.5, to = 4.0, steps = 4 }

        [analysis]
        transient = 1000
        measure = 1000
        lyapunov = "largest"
        max_period = 64
        samples = 8
        """;

    private const string Flow = """
        [model]
        kind = "flow"
        variables = ["x", "v"]
        parameters = ["a", "w"]
        forcing_period = 4.833219467042393

        [model.equations]
        x = "v"
        v = "-0.2*v - x^3 + a*cos(w*t)"

        [initial]
        x = 0.5
        v = 0

        [parameters]
        w = 1.3

        [grid]
        a = { from = 0.1, to = 0.4, steps = 3 }

        [analysis]
        transient = 10
        measure = 20
        lyapunov = "largest"
        max_period = 8
        samples = 2

        [integrator]
        method = "dopri5"
        rtol = 1e-8
        atol = 1e-10
        """;

    [Theory]
    [InlineData(Map, "d71e4a0379872698cc25d5220000474990ea403767926316eeaf8e9ca726a234", "0b1e3e11795d9832ce818810f134c38b23f408516c29ab0106e4ffb4e9fe807a")]
    [InlineData(Flow, "e59fc23e4d5c7557b036c33111d0e8eb72e9f724c94f76aee506b2a7ab852bff", "cb78d8c1f87c97744e92df10529a8be925b4fb940dfce4bce86c29b1d4c8d525")]
    public void Hashes_AreThoseOfEarlierVersions(string config, string specHash, string modelHash)
    {
        var spec = SpecReader.Parse(config, "pinned.toml");

        Assert.Equal(specHash, SpecFingerprint.SpecHash(spec));
        Assert.Equal(modelHash, SpecFingerprint.ModelHash(spec.Model));
    }
}
