using Sweeps.Core.Analysis;
using Sweeps.Core.Kernels;
using Sweeps.Core.Models;

namespace Sweeps.Core.Tests.Kernels;

/// <summary>
/// The four-lane analyzer for maps of several variables against the scalar analyzer: every field of every point's
/// result bit for bit — regime, period, exponents and their errors, mean ln|det J|, final state, cycle, samples, box,
/// reason — across periodic, chaotic and escaping points, the three Lyapunov modes, a 3 × 3 determinant by
/// elimination, and points the lanes hand back to the scalar path (escapes, collapsed directions); with the outcomes
/// handed over as results and as rows.
/// </summary>
public sealed class MapLaneAnalyzerTests
{
    public static TheoryData<string, string[], string[], double, double, double[]> Cases() => new()
    {
        // model, variables, equations (parameter r swept from..to), initial state
        { "quadratic fold with memory", ["x", "y"], ["1 - r*x^2 + y", "0.3*x"], 0.2, 1.5, [0.1, 0.1] },
        { "delayed growth", ["x", "y"], ["r*x*(1 - y)", "x"], 1.8, 2.3, [0.2, 0.3] },
        { "three-variable fold", ["x", "y", "z"], ["r - y^2 - 0.1*z", "x", "y"], 1.0, 1.9, [0.1, 0.0, 0.2] },
        { "trigonometric kick", ["u", "v"], ["u + v + r*sin(u)", "v + r*sin(u)"], 0.1, 1.4, [0.3, 0.0] },
        { "collapsing direction", ["x", "y"], ["r*x*(1 - x)", "0*y"], 2.8, 3.9, [0.3, 0.4] },
    };

    [Theory]
    [MemberData(nameof(Cases))]
    public void Lanes_GiveTheScalarResult_BitForBit(string name, string[] variables, string[] equations, double from, double to, double[] start)
    {
        var model = Maps.Map(variables, ["r"], equations);
        foreach (var settings in new[]
        {
            new AnalysisSettings(Transient: 500, Measure: 700, Lyapunov: LyapunovMode.Spectrum, MaxPeriod: 32, Samples: 8),
            new AnalysisSettings(Transient: 0, Measure: 50, Lyapunov: LyapunovMode.Largest, MaxPeriod: 64, Samples: 16),
            new AnalysisSettings(Transient: 300, Measure: 256, Lyapunov: LyapunovMode.None, MaxPeriod: 16, Samples: 4),
        })
        {
            var lanes = new MapLaneAnalyzer(model, settings);
            const int points = 23;
            SameResult.CheckEveryPoint(lanes, new MapAnalyzer(model, settings), points, start, from, to, $"{name}, {settings}");

            // As rows: every point the lanes classified themselves handed over as fields, the others as results.
            var rows = new MapLaneAnalyzer(model, settings);
            var fields = SameResult.CheckEveryRow(rows, new MapAnalyzer(model, settings), points, start, from, to, $"{name}, {settings}");
            Assert.Equal(points - rows.Rechecked, fields);

            if (name != "collapsing direction" || settings.Lyapunov == LyapunovMode.None)
            {
                // Not a comparison of the scalar path with itself: most points went through the lanes.
                Assert.True(lanes.Rechecked < points / 2, $"{name}: {lanes.Rechecked} of {points} points were handed to the scalar path");
            }
        }
    }

    [Fact]
    public void Lanes_HandEscapesAndCollapsesToTheScalarPath()
    {
        // Common practice: the quadratic fold escapes for large r; y' = 0·y has a zero tangent direction
        // (exponent −∞), which only the scalar path handles.
        var settings = new AnalysisSettings(Transient: 100, Measure: 200, Lyapunov: LyapunovMode.Spectrum, MaxPeriod: 16, Samples: 4);
        var escaping = new MapLaneAnalyzer(Maps.Map(["x", "y"], ["r"], "1 - r*x^2 + y", "0.3*x"), settings);
        var collapsing = new MapLaneAnalyzer(Maps.Map(["x", "y"], ["r"], "r*x*(1 - x)", "0*y"), settings);
        var results = new PointResult[MapLaneAnalyzer.BlockSize];
        double[][] initial = [[0.1, 0.1], [0.1, 0.1], [0.1, 0.1], [0.1, 0.1]];

        escaping.Analyze(initial, [[1.2], [3.0], [1.2], [3.0]], 4, results);
        Assert.Equal([Regime.Divergent, Regime.Divergent], new[] { results[1].Regime, results[3].Regime });
        Assert.Equal(2, escaping.Rechecked);

        collapsing.Analyze(initial, [[3.2], [3.2], [3.9], [3.9]], 4, results);
        Assert.Equal(4, collapsing.Rechecked);
        Assert.All(results, r => Assert.Equal(double.NegativeInfinity, r.Lyapunov[1]));
    }

    [Fact]
    public void BlockAnalyzers_ChooseTheLanes_ForMapsOfSeveralVariables()
    {
        var settings = new AnalysisSettings(Transient: 10, Measure: 10, Lyapunov: LyapunovMode.Spectrum, MaxPeriod: 4, Samples: 2);
        Assert.IsType<MapLaneAnalyzer>(BlockAnalyzers.Create(Maps.Henon(), settings, new Core.Integrators.IntegratorSettings(), null));
        Assert.Null(BlockAnalyzers.Create(Maps.Henon(), settings with { Indicators = true }, new Core.Integrators.IntegratorSettings(), null));
    }
}
