using Sweeps.Core.Analysis;
using Sweeps.Core.Models;
using Sweeps.Engine.Config;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Tests.Config;

public sealed class SpecReaderTests
{
    private const string Valid = """
        [model]
        kind = "map"
        variables = ["x", "y"]
        parameters = ["a", "b"]
        [model.equations]
        x = "1 - a*x^2 + y"
        y = "b*x"
        [initial]
        x = 0.1
        [parameters]
        b = 0.3
        [grid]
        a = { from = 1.0, to = 1.4, steps = 5 }
        y = { values = [0.0, 0.5] }
        [analysis]
        transient = 10
        measure = 200
        lyapunov = "largest"
        max_period = 16
        tolerance = 1e-8
        [output]
        dir = "runs/x"
        """;

    [Fact]
    public void Parse_ReadsEveryKey_WhenConfigIsValid()
    {
        var spec = SpecReader.Parse(Valid, "valid.toml");
        Assert.Equal(ModelKind.Map, spec.Model.Kind);
        Assert.Equal(["x", "y"], spec.Model.Variables);
        Assert.Equal(["1 - a*x^2 + y", "b*x"], spec.Model.Equations);
        Assert.Equal([0.1, 0.0], spec.Initial);
        Assert.Equal([1.0, 0.3], spec.Parameters);
        Assert.Equal(10, spec.Grid.PointCount);
        Assert.Equal(new AnalysisSettings(10, 200, LyapunovMode.Largest, 16, 1e-8), spec.Analysis);
        Assert.Equal("runs/x", spec.OutputDirectory);
        Assert.Equal(AxisTarget.Variable, spec.Grid.Axes[1].Target);
    }

    [Fact]
    public void Parse_ReportsEveryProblem_NotOnlyTheFirst()
    {
        var text = Valid.Replace("transient = 10", "transient = -1").Replace("tolerance = 1e-8", "tolerance = 0.0").Replace("[output]", "[outptu]");
        var error = Assert.Throws<ConfigException>(() => SpecReader.Parse(text, "f.toml"));
        Assert.Equal(
            [
                "f.toml:21:1: outptu: unknown key (did you mean 'output'?)",
                "f.toml:20:13: analysis.tolerance: 0 is out of range (between 0 and 1, exclusive)",
                "f.toml:16:13: analysis.transient: -1 is out of range (0 to 10000000000)",
            ],
            error.Problems.Select(p => p.ToString()).OrderByDescending(p => p, StringComparer.Ordinal));
    }

    [Fact]
    public void Parse_PointsIntoTheEquationString_ForExpressionErrors()
    {
        var text = Valid.Replace("\"b*x\"", "\"b*xx\"");
        var error = Assert.Throws<ConfigException>(() => SpecReader.Parse(text, "f.toml"));

        // Line 7 is `y = "b*xx"`: the string opens at column 5, so equation column 3 is file column 8.
        Assert.Equal("f.toml:7:8: model.equations.y: col 3: unknown name 'xx' (did you mean 'x'?)", Assert.Single(error.Problems).ToString());
    }

    [Fact]
    public void Parse_UsesDefaults_WhenAnalysisIsAbsent()
    {
        var text = Valid[..Valid.IndexOf("[analysis]", StringComparison.Ordinal)];
        Assert.Equal(new AnalysisSettings(), SpecReader.Parse(text, "f.toml").Analysis);
    }
}
