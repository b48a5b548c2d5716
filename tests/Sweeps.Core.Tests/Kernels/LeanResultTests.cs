using Sweeps.Core.Analysis;
using Sweeps.Core.Kernels;

namespace Sweeps.Core.Tests.Kernels;

/// <summary>
/// Lean map results (for part files, which store no cycle states or boxes) against full ones: the same result bit for
/// bit with the cycle and the box left out — the cycle's multiplier, hence the regime of points on an unstable cycle,
/// included — through the scalar analyzer and both block analyzers.
/// </summary>
public sealed class LeanResultTests
{
    [Theory]
    [InlineData("r*x*(1 - x)", 2.8, 4.0)]
    [InlineData("r*x*(1 - x)", 1.9, 2.1)]
    [InlineData("2*x - floor(2*x) + 0*r", 0.0, 1.0)]
    public void Lean_LeavesOutCycleAndBoxOnly_ForOneVariable(string equation, double from, double to)
    {
        var model = Maps.Map(["x"], ["r"], equation);
        var settings = new AnalysisSettings(Transient: 300, Measure: 400, Lyapunov: LyapunovMode.Largest, MaxPeriod: 32, Samples: 8);
        var full = new MapAnalyzer(model, settings);
        var lean = new MapAnalyzer(model, settings) { Lean = true };
        Compare(full, lean, [0.3], from, to, equation);
        SameResult.CheckEveryPoint(new MapBlockAnalyzer(model, settings, lean: true), lean, 45, [0.3], from, to, $"{equation}, block");
    }

    [Fact]
    public void Lean_LeavesOutCycleAndBoxOnly_ForSeveralVariables()
    {
        var model = Maps.Henon();
        var settings = new AnalysisSettings(Transient: 300, Measure: 400, Lyapunov: LyapunovMode.Spectrum, MaxPeriod: 32, Samples: 8);
        var full = new MapAnalyzer(model, settings);
        var lean = new MapAnalyzer(model, settings) { Lean = true };
        Compare(full, lean, [0.1, 0.1], 0.2, 1.4, "quadratic fold with memory", b: 0.3);
        var lanes = new MapLaneAnalyzer(model, settings, lean: true);
        var (initial, parameters, results) = (new double[4][], new double[4][], new PointResult[4]);
        for (var i = 0; i < 4; i++)
        {
            (initial[i], parameters[i]) = ([0.1, 0.1], [0.3 + (0.3 * i), 0.3]);
        }

        lanes.Analyze(initial, parameters, 4, results);
        for (var i = 0; i < 4; i++)
        {
            SameResult.Check(lean.Analyze(initial[i], parameters[i]), results[i], $"lanes, a = {parameters[i][0]}");
        }
    }

    private static void Compare(MapAnalyzer full, MapAnalyzer lean, double[] start, double from, double to, string where, double? b = null)
    {
        var periodic = 0;
        for (var k = 0; k < 40; k++)
        {
            double[] parameters = b is { } second ? [from + ((to - from) * k / 39), second] : [from + ((to - from) * k / 39)];
            var expected = full.Analyze(start, parameters);
            var actual = lean.Analyze(start, parameters);
            Assert.Empty(actual.Cycle);
            Assert.Null(actual.Box);
            SameResult.Check(expected with { Cycle = [], Box = null }, actual, $"{where}, {parameters[0]:R}");
            periodic += expected.Cycle.Count > 0 ? 1 : 0;
        }

        // Common practice: these ranges hold cycles as well as chaos, so the multiplier path is exercised.
        Assert.True(periodic > 0, $"{where}: no periodic point in the range");
    }
}
