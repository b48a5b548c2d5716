using Sweeps.Core.Analysis;

namespace Sweeps.Core.Tests.Analysis;

public sealed class IdentityTests
{
    // Exact: the tent map μ·min(x, 1 − x) has |f'| = μ everywhere, so λ = ln μ.
    [Theory]
    [InlineData(1.5)]
    [InlineData(1.9)]
    public void Analyze_GivesLnMu_ForTentMap(double mu)
    {
        var tent = Maps.Map(["x"], ["mu"], "mu*min(x, 1 - x)");
        var result = new MapAnalyzer(tent, new AnalysisSettings(Transient: 100, Measure: 100_000)).Analyze([0.2137], [mu]);
        Assert.Equal(Regime.Chaotic, result.Regime);
        Tolerance.Relative(Math.Log(mu), result.Lyapunov[0], Tolerance.Identity, "λ");
    }

    // Exact: 2x mod 1 has f' ≡ 2 (λ = ln 2), but in binary every orbit reaches the unstable fixed point
    // 0 within about 55 steps; the analyzer must say so rather than report a fixed point.
    [Fact]
    public void Analyze_ReportsCollapse_ForDoublingMap()
    {
        var doubling = Maps.Map(["x"], [], "mod(2*x, 1)");
        var result = new MapAnalyzer(doubling, new AnalysisSettings()).Analyze([0.1234567], []);
        Assert.Equal(Regime.Unresolved, result.Regime);
        Assert.Contains("floating-point collapse", result.Reason);
        Tolerance.Close(Math.Log(2), result.Lyapunov[0], Tolerance.Rounding, "λ");
    }

    // Exact: for a linear map x → A x the tangent map is A itself, so the spectrum is ln|eig A|, largest first.
    [Fact]
    public void Analyze_GivesLogEigenvalues_ForLinearMap()
    {
        var linear = Maps.Map(["u", "v", "w"], [], "0.5*u + 0.2*v", "0.3*v + 0.1*w", "-0.8*w");
        var result = new MapAnalyzer(linear, new AnalysisSettings(Transient: 0, Measure: 2000)).Analyze([1, 1, 1], []);
        Assert.Equal(Regime.FixedPoint, result.Regime);
        double[] expected = [Math.Log(0.8), Math.Log(0.5), Math.Log(0.3)];
        for (var i = 0; i < 3; i++)
        {
            Tolerance.Close(expected[i], result.Lyapunov[i], 1e-3, $"λ{i + 1}");
        }

        Tolerance.Relative(expected.Sum(), result.Lyapunov.Sum(), Tolerance.Identity, "Σλ");
    }

    // Exact: on the fixed point 1 − 1/r of the logistic map f' = 2 − r; at r = 2.8 that is −0.8 (stable),
    // and the origin has f' = r = 2.8 (unstable).
    [Fact]
    public void FixedPoints_AreClassifiedByTheirMultipliers_ForLogisticMap()
    {
        var found = new FixedPointFinder(Maps.Logistic()).Find(FixedPointFinder.Starts([[0.3]], 1), [2.8]);
        Assert.Equal(2, found.Count);
        Assert.Equal(0.0, found[0].State[0], 12);
        Assert.Equal(FixedPointKind.UnstableNode, found[0].Kind);
        Tolerance.Relative(1 - (1 / 2.8), found[1].State[0], Tolerance.Rounding, "x*");
        Tolerance.Relative(-0.8, found[1].Eigenvalues[0].Real, Tolerance.Rounding, "f'(x*)");
        Assert.Equal(FixedPointKind.StableNode, found[1].Kind);
    }
}
