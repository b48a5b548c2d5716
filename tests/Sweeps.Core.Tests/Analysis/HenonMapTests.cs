using Sweeps.Core.Analysis;

namespace Sweeps.Core.Tests.Analysis;

public sealed class HenonMapTests
{
    private static readonly AnalysisSettings Long = new(Transient: 1000, Measure: 1_000_000);

    // λ1 = 0.41922, λ2 = −1.62319 at a = 1.4, b = 0.3: J. C. Sprott, "Common Chaotic Systems" table;
    // M. Hénon, Commun. Math. Phys. 50 (1976) 69–77.
    [Fact]
    public void Analyze_MatchesPublishedSpectrum_AtClassicParameters()
    {
        var result = new MapAnalyzer(Maps.Henon(), Long).Analyze([0.1, 0.1], [1.4, 0.3]);
        Assert.Equal(Regime.Chaotic, result.Regime);
        Tolerance.Close(0.41922, result.Lyapunov[0], Tolerance.PublishedHenonExponent, "λ1");
        Tolerance.Close(-1.62319, result.Lyapunov[1], Tolerance.PublishedHenonExponent, "λ2");
    }

    // Exact: det J = −b everywhere, so λ1 + λ2 = ln b, and the mean ln|det J| is ln b too.
    [Fact]
    public void Analyze_SpectrumSumsToLnB_ToIdentityTolerance()
    {
        var result = new MapAnalyzer(Maps.Henon(), Long with { Measure = 200_000 }).Analyze([0.1, 0.1], [1.4, 0.3]);
        Tolerance.Relative(Math.Log(0.3), result.Lyapunov.Sum(), Tolerance.Identity, "Σλ");
        Tolerance.Relative(Math.Log(0.3), result.LogDetMean, Tolerance.Identity, "mean ln|det J|");
    }

    // Exact: the fixed points solve a x² + (1 − b) x − 1 = 0, y = b x; at the classic parameters both are saddles.
    [Fact]
    public void FixedPoints_AreTheRootsOfTheQuadratic_AndSaddles()
    {
        var (a, b) = (1.4, 0.3);
        var root = Math.Sqrt(((1 - b) * (1 - b)) + (4 * a));
        double[] expected = [(-(1 - b) - root) / (2 * a), (-(1 - b) + root) / (2 * a)];
        var model = Maps.Henon();
        var found = new FixedPointFinder(model).Find(FixedPointFinder.Starts([[0.1, 0.1]], 2), [a, b]);
        Assert.Equal(2, found.Count);
        for (var i = 0; i < 2; i++)
        {
            Tolerance.Relative(expected[i], found[i].State[0], Tolerance.Rounding, "x*");
            Tolerance.Relative(b * expected[i], found[i].State[1], Tolerance.Rounding, "y*");
            Assert.Equal(FixedPointKind.Saddle, found[i].Kind);
        }
    }
}
