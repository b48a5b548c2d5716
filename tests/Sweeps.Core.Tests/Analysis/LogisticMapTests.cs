using Sweeps.Core.Analysis;

namespace Sweeps.Core.Tests.Analysis;

public sealed class LogisticMapTests
{
    private static readonly AnalysisSettings Settings = new(Transient: 20_000, Measure: 4_000, MaxPeriod: 64);

    private static PointResult At(double r, double x0 = 0.3, AnalysisSettings? settings = null) =>
        new MapAnalyzer(Maps.Logistic(), settings ?? Settings).Analyze([x0], [r]);

    // Period-doubling points r1 = 3, r2 = 1+√6 = 3.449489742783178, r3 = 3.5440903, r4 = 3.5644073,
    // r5 = 3.5687594: Alligood, Sauer & Yorke, "Chaos: An Introduction to Dynamical Systems",
    // Springer 1996, p. 504. Each r below lies well inside one interval between them.
    [Theory]
    [InlineData(2.8, 1)]
    [InlineData(3.2, 2)]
    [InlineData(3.5, 4)]
    [InlineData(3.56, 8)]
    [InlineData(3.567, 16)]
    public void Analyze_FindsPeriodOfTheDoublingCascade_BetweenPublishedBifurcations(double r, int period)
    {
        var result = At(r);
        Assert.Equal(period, result.Period);
        Assert.Equal(period == 1 ? Regime.FixedPoint : Regime.Periodic, result.Regime);
        Assert.True(result.Lyapunov[0] < 0, $"λ = {result.Lyapunov[0]} on a stable cycle");
    }

    // The period-3 window opens at the tangent bifurcation r = 1 + √8 = 3.8284271 (exact); the stable
    // 3-cycle persists up to about 3.8414909 (upper end: value from memory of the logistic-map literature).
    [Theory]
    [InlineData(3.8285)]
    [InlineData(3.83)]
    [InlineData(3.84)]
    public void Analyze_FindsPeriodThree_InsideThePeriodThreeWindow(double r)
    {
        var result = At(r, settings: Settings with { Transient = 100_000 });
        Assert.Equal(Regime.Periodic, result.Regime);
        Assert.Equal(3, result.Period);
        Assert.Equal(3, result.Cycle.Count);
    }

    // λ = ln 2 at r = 4: R. May, Nature 261 (1976) 459–467; exact through the conjugacy to the tent map.
    [Fact]
    public void Analyze_GivesLn2_AtR4()
    {
        var result = At(4.0, 0.3, Settings with { Transient = 1000, Measure = 1_000_000, Lyapunov = LyapunovMode.Largest });
        Assert.Equal(Regime.Chaotic, result.Regime);
        Tolerance.Close(Math.Log(2), result.Lyapunov[0], Tolerance.PublishedMapExponent, "λ at r = 4");
    }

    // Exact: on the fixed point 1 − 1/r, λ = ln|2 − r|; on the 2-cycle, λ = ½ ln|4 + 2r − r²|.
    [Theory]
    [InlineData(2.8, -0.2231435513142097)]
    [InlineData(3.2, -0.916290731874155)]
    public void Analyze_GivesExactExponent_OnStableCycles(double r, double expected)
    {
        var exact = r < 3 ? Math.Log(Math.Abs(2 - r)) : 0.5 * Math.Log(Math.Abs(4 + (2 * r) - (r * r)));
        Tolerance.Close(expected, exact, Tolerance.Rounding, "formula");
        Tolerance.Close(exact, At(r).Lyapunov[0], 1e-6, "λ");
    }

    // Exact: at r = 1 + √5 the 2-cycle passes through x = 1/2 where f' = 0 (superstable), so the
    // exponent is −∞ or very negative — never NaN — and the regime stays right.
    [Fact]
    public void Analyze_KeepsExponentNegativeAndRegimePeriodic_OnSuperstableCycle()
    {
        var result = At(1 + Math.Sqrt(5), 0.5);
        Assert.Equal(Regime.Periodic, result.Regime);
        Assert.Equal(2, result.Period);
        Assert.False(double.IsNaN(result.Lyapunov[0]));
        Assert.True(result.Lyapunov[0] < -10, $"λ = {result.Lyapunov[0]}");
    }

    // Exact: x0 = 1/2 at r = 4 goes to 1 and then sticks on the unstable fixed point 0; the honest
    // answer is "not an attractor", not "fixed point".
    [Fact]
    public void Analyze_ReportsCollapse_WhenOrbitLandsOnUnstableFixedPoint()
    {
        var result = At(4.0, 0.5);
        Assert.Equal(Regime.Unresolved, result.Regime);
        Assert.Contains("floating-point collapse", result.Reason);
        Tolerance.Close(Math.Log(4), result.Lyapunov[0], Tolerance.Rounding, "tangent exponent at 0");
    }

    [Fact]
    public void Analyze_ReportsDivergenceWithStep_WhenOrbitEscapes()
    {
        var result = At(4.5, 0.5, Settings with { Escape = 1e6 });
        Assert.Equal(Regime.Divergent, result.Regime);
        Assert.NotNull(result.DivergedAt);
        Assert.InRange(result.DivergedAt!.Value, 2, 20);
        Assert.Contains($"iteration {result.DivergedAt}", result.Reason);
    }

    // Just below r2 = 1 + √6 the 2-cycle's multiplier 4 + 2r − r² is close to −1 (exact), so its returns
    // alternate about the cycle and repeat every 4 steps before they repeat every 2: still period 2.
    [Fact]
    public void Analyze_KeepsPeriodTwo_WhenTheTwoCycleConvergesWithMultiplierNearMinusOne()
    {
        var r = 1 + Math.Sqrt(6) - 0.01;
        var result = At(r, 0.3, new AnalysisSettings(Transient: 400, Measure: 200, MaxPeriod: 16));
        Assert.Equal(Regime.Periodic, result.Regime);
        Assert.Equal(2, result.Period);
    }

    [Fact]
    public void Analyze_IsDeterministic_WhenAnalyzerIsReused()
    {
        var analyzer = new MapAnalyzer(Maps.Logistic(), Settings);
        var first = analyzer.Analyze([0.3], [3.7]);
        _ = analyzer.Analyze([0.2], [3.2]);
        var again = analyzer.Analyze([0.3], [3.7]);
        Assert.Equal(first.Lyapunov, again.Lyapunov);
        Assert.Equal(first.FinalState, again.FinalState);
    }

    // Just above the period-doubling point r2 = 1 + √6 (Alligood, Sauer & Yorke 1996, p. 504) the new
    // 4-cycle attracts slowly: 200 iterations of transient do not settle it within tolerance, 400 do,
    // and the check reports the disagreement instead of guessing. Well inside an interval both agree.
    [Fact]
    public void TransientCheck_FlagsPointsWhereALongerTransientDisagrees()
    {
        var settings = new AnalysisSettings(Transient: 200, Measure: 200, MaxPeriod: 16, Tolerance: 1e-9);
        var model = Maps.Logistic();
        var checkedAnalyzer = new CrossCheckedAnalyzer(new MapAnalyzer(model, settings), new MapAnalyzer(model, settings with { Transient = 400 }), "transient", "twice the transient");
        var near = checkedAnalyzer.Analyze([0.3], [1 + Math.Sqrt(6) + 0.005]);
        Assert.Equal(Regime.Unresolved, near.Regime);
        Assert.StartsWith("transient: ", near.Reason);

        var inside = checkedAnalyzer.Analyze([0.3], [3.2]);
        Assert.Equal(Regime.Periodic, inside.Regime);
        Assert.Equal(2, inside.Period);
    }
}
