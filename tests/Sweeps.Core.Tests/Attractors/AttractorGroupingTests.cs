using Sweeps.Core.Analysis;
using Sweeps.Core.Attractors;
using Sweeps.Core.Integrators;
using Sweeps.Core.Models;

namespace Sweeps.Core.Tests.Attractors;

public sealed class AttractorGroupingTests
{
    private static double[] Lattice(double from, double to, int steps) =>
        Enumerable.Range(0, steps).Select(i => from + ((to - from) * i / (steps - 1))).ToArray();

    private static IReadOnlyList<FoundAttractor> Group(IPointAnalyzer analyzer, IEnumerable<double[]> starts, double[] parameters, AnalysisSettings settings) =>
        AttractorGrouping.Group(starts.Select(s => analyzer.Analyze(s, parameters)).ToList(), settings);

    // Exact: the odd cubic map x' = a·x − x³ has fixed points 0 and ±√(a − 1); at a = 1.5 the outer two have
    // f' = 3 − 2a = 0 (superstable) and 0 is unstable (f' = a). On (0, 1] every orbit rises monotonically to
    // +√0.5 (f(x) − x = x(0.5 − x²) > 0 below it and f maps (0, √a) into (0, √0.5]); by oddness (−1, 0) goes to
    // −√0.5. Sixteen lattice starts on [−1, 1] avoid 0, so exactly two attractors with basin fractions ½ each.
    [Fact]
    public void Group_FindsBothFixedPointsOfTheBistableCubicMap_WithHalfTheStartsEach()
    {
        var settings = new AnalysisSettings(Transient: 500, Measure: 500, MaxPeriod: 16);
        var analyzer = new MapAnalyzer(Maps.Map(["x"], ["a"], "a*x - x^3"), settings);
        var found = Group(analyzer, Lattice(-1, 1, 16).Select(x => new[] { x }), [1.5], settings);

        Assert.Equal(2, found.Count);
        Assert.All(found, a => Assert.Equal(Regime.FixedPoint, a.Result.Regime));
        Assert.All(found, a => Assert.Equal(0.5, a.BasinFraction));
        Assert.Equal(1.0, found.Sum(a => a.BasinFraction), 15);
        var states = found.Select(a => a.Signature.State[0]).Order().ToArray();
        Tolerance.Close(-Math.Sqrt(0.5), states[0], 1e-12, "x−");
        Tolerance.Close(Math.Sqrt(0.5), states[1], 1e-12, "x+");

        // Ids: largest basin first, ties broken by the first start reaching it (start 0 is x = −1).
        Assert.Equal([0, 1], found.Select(a => a.Id));
        Assert.Equal(0, found[0].FirstStart);
        Assert.True(found[0].Signature.State[0] < 0);
    }

    // Published: the logistic map x' = r·x(1 − x) has a stable 2-cycle for 3 < r < 1 + √6 (May, Nature 261 (1976)
    // 459–467). Starts reach it in either phase; it is one attractor, not two.
    [Fact]
    public void Group_MergesOneCycleReachedInDifferentPhases()
    {
        var settings = new AnalysisSettings(Transient: 1000, Measure: 1000, MaxPeriod: 16);
        var analyzer = new MapAnalyzer(Maps.Logistic(), settings);
        var found = Group(analyzer, Lattice(0.05, 0.95, 10).Select(x => new[] { x }), [3.2], settings);

        var only = Assert.Single(found);
        Assert.Equal(Regime.Periodic, only.Result.Regime);
        Assert.Equal(2, only.Result.Period);
        Assert.Equal(1.0, only.BasinFraction);

        // The representative is the cycle's lower point, whichever phase the first start ended in.
        // Exact: the 2-cycle is (r + 1 ∓ √((r − 3)(r + 1))) / (2r).
        var r = 3.2;
        Tolerance.Close((r + 1 - Math.Sqrt((r - 3) * (r + 1))) / (2 * r), only.Signature.State[0], 1e-9, "lower cycle point");
    }

    // Published: at r = 4 the logistic map is chaotic on [0, 1] with λ = ln 2 (R. May, Nature 261 (1976) 459–467;
    // exact through the conjugacy to the tent map). Orbits from different starts fill the same interval: one attractor.
    [Fact]
    public void Group_MergesOrbitsOnOneChaoticAttractor()
    {
        var settings = new AnalysisSettings(Transient: 1000, Measure: 20_000, MaxPeriod: 64);
        var analyzer = new MapAnalyzer(Maps.Logistic(), settings);
        double[] starts = [0.11, 0.23, 0.37, 0.41, 0.53, 0.67, 0.71, 0.89];
        var found = Group(analyzer, starts.Select(x => new[] { x }), [4.0], settings);

        var only = Assert.Single(found);
        Assert.Equal(Regime.Chaotic, only.Result.Regime);
        Assert.Equal(8, only.Starts);
    }

    // Exact (symmetry): the damped double well x'' + δx' − x + x³ = 0 has stable equilibria (±1, 0) and a saddle
    // at the origin; it is invariant under (x, v) → (−x, −v), so a lattice symmetric about the origin (and off
    // the saddle's stable manifold) sends exactly half its starts to each well.
    [Fact]
    public void Group_SplitsASymmetricLatticeEvenlyBetweenTheTwoWellsOfADampedFlow()
    {
        var settings = new AnalysisSettings(Transient: 100, Measure: 200, Tolerance: 1e-6, ZeroBand: 5e-3);
        var model = Maps.Build(ModelKind.Flow, ["x", "v"], ["delta"], "v", "-delta*v + x - x^3");
        var analyzer = new FlowAnalyzer(model, settings, new IntegratorSettings(IntegratorMethod.Rk4, 0.01), new SectionSettings());
        var axis = Lattice(-2, 2, 4);
        var starts = axis.SelectMany(x => axis.Select(v => new[] { x, v }));
        var found = Group(analyzer, starts, [0.5], settings);

        Assert.Equal(2, found.Count);
        Assert.All(found, a => Assert.Equal(Regime.FixedPoint, a.Result.Regime));
        Assert.All(found, a => Assert.Equal(0.5, a.BasinFraction));
        var wells = found.Select(a => a.Signature.State[0]).Order().ToArray();
        Tolerance.Close(-1, wells[0], 1e-6, "left well");
        Tolerance.Close(1, wells[1], 1e-6, "right well");
    }

    // Common practice: escape to infinity is one outcome, so divergent starts share one basin and the fractions
    // still sum to 1. The logistic map at r = 3.2 sends starts outside [0, 1] off to −∞.
    [Fact]
    public void Group_CountsEscapeAsOneOutcome()
    {
        var settings = new AnalysisSettings(Transient: 1000, Measure: 1000, MaxPeriod: 16);
        var analyzer = new MapAnalyzer(Maps.Logistic(), settings);
        double[] starts = [-0.5, 0.2, 1.5, 0.6, -2, 0.9];
        var found = Group(analyzer, starts.Select(x => new[] { x }), [3.2], settings);

        Assert.Equal(2, found.Count);
        Assert.Equal(Regime.Divergent, found[0].Result.Regime);
        Assert.Equal(Regime.Periodic, found[1].Result.Regime);
        Assert.Equal([0.5, 0.5], found.Select(a => a.BasinFraction));
    }

    // Common practice (the matching rule itself): chaotic sets with disjoint boxes are different attractors;
    // with overlapping boxes and exponents within their errors they are one.
    [Fact]
    public void Matches_SeparatesChaoticSetsByBoxAndExponent()
    {
        static AttractorSignature Chaotic(double low, double high, double exponent) =>
            new(Regime.Chaotic, 0, [low], new StateBox([low], [high]), exponent, 0.001);

        Assert.False(Chaotic(-1, -0.2, 0.3).Matches(Chaotic(0.2, 1, 0.3), 1e-9, 1e-3));
        Assert.True(Chaotic(-1, 0.1, 0.3).Matches(Chaotic(0, 1, 0.31), 1e-9, 1e-3));
        Assert.False(Chaotic(-1, 0.1, 0.3).Matches(Chaotic(0, 1, 0.6), 1e-9, 1e-3));
        Assert.False(Chaotic(-1, 1, 0.3).Matches(Chaotic(-1, 1, 0.3) with { Regime = Regime.QuasiPeriodic }, 1e-9, 1e-3));
    }

    // The catalog labels attractors consistently across a grid: the same well always gets the same label.
    [Fact]
    public void Catalog_GivesTheSameAttractorTheSameLabelAcrossPoints()
    {
        var settings = new AnalysisSettings(Transient: 500, Measure: 500, MaxPeriod: 16);
        var analyzer = new MapAnalyzer(Maps.Map(["x"], ["a"], "a*x - x^3"), settings);
        var catalog = new AttractorCatalog(settings.Tolerance, settings.ZeroBand);
        var labels = Lattice(-1, 1, 16)
            .Select(x => catalog.Label(AttractorSignature.Of(analyzer.Analyze([x], [1.5]), settings.Tolerance)))
            .ToArray();

        Assert.Equal(Enumerable.Repeat(0, 8).Concat(Enumerable.Repeat(1, 8)), labels);
        Assert.Equal(2, catalog.Known.Count);
        Assert.False(catalog.Overflowed);
    }
}
