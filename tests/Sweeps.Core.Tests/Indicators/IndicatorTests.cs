using Sweeps.Core.Indicators;

namespace Sweeps.Core.Tests.Indicators;

public sealed class IndicatorTests
{
    private static double[] Logistic(double r, int count, double x = 0.3, int transient = 1000)
    {
        for (var i = 0; i < transient; i++)
        {
            x = r * x * (1 - x);
        }

        var series = new double[count];
        for (var i = 0; i < count; i++)
        {
            x = r * x * (1 - x);
            series[i] = x;
        }

        return series;
    }

    // Gottwald & Melbourne (2004, 2009): K ≈ 1 for chaotic dynamics (logistic map at r = 4), K ≈ 0 for
    // periodic (r = 3.5, period 4) and quasi-periodic (an irrational rotation) signals.
    [Fact]
    public void ZeroOneTest_SeparatesChaosFromRegularMotion()
    {
        Assert.InRange(ZeroOneTest.K(Logistic(4.0, 2000)), 0.9, 1.01);
        Assert.InRange(ZeroOneTest.K(Logistic(3.5, 2000)), -0.2, 0.1);
        var golden = (Math.Sqrt(5) - 1) / 2;
        var rotation = Enumerable.Range(0, 2000).Select(j => Math.Cos(2 * Math.PI * golden * j) + (0.5 * Math.Cos(2 * Math.PI * Math.Sqrt(2) * j))).ToArray();
        Assert.InRange(ZeroOneTest.K(rotation), -0.2, 0.1);
    }

    // Bandt & Pompe (2002): ln(n!) for i.i.d. noise, 0 for a monotone series.
    [Fact]
    public void PermutationEntropy_IsLnFactorialForNoise_AndZeroForMonotone()
    {
        var random = new Random(42);
        var noise = Enumerable.Range(0, 200_000).Select(_ => random.NextDouble()).ToArray();
        Assert.Equal(Math.Log(24), PermutationEntropy.Compute(noise, 4), 2);
        Assert.Equal(0.0, PermutationEntropy.Compute(Enumerable.Range(0, 1000).Select(i => (double)i).ToArray(), 4));
        Assert.Equal(0.0, PermutationEntropy.Compute(Enumerable.Range(0, 1000).Select(i => -Math.Exp(i / 100.0)).ToArray(), 3));
    }

    // Lempel & Ziv, IEEE Trans. Inf. Theory 22 (1976): 1001111011000010 parses into 6 phrases
    // (1 · 0 · 01 · 1110 · 1100 · 0010).
    [Fact]
    public void LempelZiv_CountsThePhrasesOfThePublishedExample()
    {
        var symbols = "1001111011000010".Select(c => (byte)(c - '0')).ToArray();
        Assert.Equal(6, LempelZiv.Phrases(symbols));
    }

    // Common practice: a chaotic itinerary is near-incompressible (normalised complexity near 1), a
    // periodic one compresses (near 0).
    [Fact]
    public void LempelZiv_SeparatesChaoticFromPeriodicItineraries()
    {
        Assert.InRange(LempelZiv.NormalisedComplexity(Logistic(4.0, 4096)), 0.8, 1.2);
        Assert.InRange(LempelZiv.NormalisedComplexity(Logistic(3.5, 4096)), 0, 0.1);
    }

    // The analyzer's second opinion agrees with the exponent on published cases: chaos at r = 4 (λ = ln 2,
    // May 1976), the 4-cycle at r = 3.5 (Alligood, Sauer & Yorke 1996, p. 504).
    [Fact]
    public void MapAnalyzer_ComputesIndicatorsThatAgreeWithTheExponent_WhenAsked()
    {
        var settings = new Sweeps.Core.Analysis.AnalysisSettings(Transient: 1000, Measure: 4000, Indicators: true);
        var analyzer = new Sweeps.Core.Analysis.MapAnalyzer(Maps.Logistic(), settings);
        var chaotic = analyzer.Analyze([0.3], [4.0]);
        Assert.Equal(Sweeps.Core.Analysis.Regime.Chaotic, chaotic.Regime);
        Assert.InRange(chaotic.Indicators!.K, 0.9, 1.01);
        Assert.Null(chaotic.Reason);
        var periodic = analyzer.Analyze([0.3], [3.5]);
        Assert.Equal(4, periodic.Period);
        Assert.InRange(periodic.Indicators!.K, -0.2, 0.1);
        Assert.Null(periodic.Reason);
        Assert.Null(new Sweeps.Core.Analysis.MapAnalyzer(Maps.Logistic(), settings with { Indicators = false }).Analyze([0.3], [4.0]).Indicators);
    }

    // Flows give their second opinion on the section points. Lorenz at σ = 10, ρ = 28, β = 8/3 is chaotic
    // (E. N. Lorenz, J. Atmos. Sci. 20 (1963) 130–141): K near 1. The Van der Pol limit cycle at μ = 1 crosses the
    // section at one point (common practice: a cycle of period 1 in section returns): a constant series, K = 0.
    [Fact]
    public void FlowAnalyzer_ComputesIndicatorsOnTheSectionPoints_ThatAgreeWithTheExponent()
    {
        var integrator = new Sweeps.Core.Integrators.IntegratorSettings(Sweeps.Core.Integrators.IntegratorMethod.Rk4, 0.005);
        var settings = new Sweeps.Core.Analysis.AnalysisSettings(Transient: 50, Measure: 1500, Tolerance: 1e-6, ZeroBand: 0.01, Indicators: true);
        var lorenz = Maps.Build(Sweeps.Core.Models.ModelKind.Flow, ["x", "y", "z"], ["sigma", "rho", "beta"], "sigma*(y - x)", "x*(rho - z) - y", "x*y - beta*z");
        var section = new Sweeps.Core.Analysis.SectionSettings(2, 27, Sweeps.Core.Analysis.SectionDirection.Up);
        var chaotic = new Sweeps.Core.Analysis.FlowAnalyzer(lorenz, settings, integrator, section).Analyze([1, 1, 1], [10, 28, 8.0 / 3]);
        Assert.Equal(Sweeps.Core.Analysis.Regime.Chaotic, chaotic.Regime);
        Assert.InRange(chaotic.Indicators!.K, 0.8, 1.01);
        Assert.Null(chaotic.Reason);

        var vanDerPol = Maps.Build(Sweeps.Core.Models.ModelKind.Flow, ["x", "v"], ["mu"], "v", "mu*(1 - x^2)*v - x");
        var cycle = new Sweeps.Core.Analysis.FlowAnalyzer(vanDerPol, settings with { Transient = 100, Measure = 1000 }, integrator, new Sweeps.Core.Analysis.SectionSettings())
            .Analyze([2, 0], [1]);
        Assert.Equal(Sweeps.Core.Analysis.Regime.Periodic, cycle.Regime);
        Assert.Equal(0, cycle.Indicators!.K);
        Assert.Null(cycle.Reason);
    }
}
