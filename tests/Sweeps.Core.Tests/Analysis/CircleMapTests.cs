using Sweeps.Core.Analysis;

namespace Sweeps.Core.Tests.Analysis;

public sealed class CircleMapTests
{
    private static readonly AnalysisSettings Settings = new(Transient: 2000, Measure: 20_000);

    private static PointResult At(double omega, double k, double theta0 = 0.1) =>
        new MapAnalyzer(Maps.Circle(), Settings).Analyze([theta0], [omega, k]);

    // Exact: with K = 0 the map is a rotation by Ω; a rational Ω = p/q (lowest terms) has period q.
    [Theory]
    [InlineData(1, 3)]
    [InlineData(2, 5)]
    [InlineData(3, 7)]
    public void Analyze_FindsPeriodQ_ForRationalRotation(int p, int q)
    {
        var result = At((double)p / q, 0);
        Assert.Equal(Regime.Periodic, result.Regime);
        Assert.Equal(q, result.Period);
        Assert.Equal(0.0, result.Lyapunov[0]);
    }

    // Exact: an irrational rotation never repeats and has λ = 0.
    [Fact]
    public void Analyze_ReportsQuasiPeriodic_ForGoldenRotation()
    {
        var result = At((Math.Sqrt(5) - 1) / 2, 0);
        Assert.Equal(Regime.QuasiPeriodic, result.Regime);
        Assert.Equal(0, result.Period);
    }

    // Theorem of circle diffeomorphisms: for K < 1 the map is invertible and λ ≤ 0 for every Ω.
    [Fact]
    public void Analyze_NeverGivesPositiveExponent_WhenKBelowOne()
    {
        for (var omega = 0.0; omega < 1.0; omega += 0.01)
        {
            var result = At(omega, 0.8);
            Assert.True(result.Lyapunov[0] <= Math.Max(Settings.ZeroBand, result.LyapunovError[0]), $"Ω = {omega}: λ = {result.Lyapunov[0]}");
            Assert.NotEqual(Regime.Chaotic, result.Regime);
        }
    }

    // Exact: at K = 1, Ω = 1/2 the orbit of 0 is 0 → 1/2 → 0 with f'(0) = 1 − K = 0: a superstable
    // cycle of rotation number 1/2. The lift (the same map without mod) advances by exactly 1 per two
    // iterations, i.e. winding number 1/2, and the analyzer reports period 2 with λ = −∞, not NaN.
    [Fact]
    public void Analyze_LocksToWindingNumberOneHalf_AtCriticalCoupling()
    {
        var result = At(0.5, 1, theta0: 0);
        Assert.Equal(Regime.Periodic, result.Regime);
        Assert.Equal(2, result.Period);
        Assert.Equal(double.NegativeInfinity, result.Lyapunov[0]);

        var lift = Maps.Map(["theta"], ["omega", "k"], "theta + omega - k/(2*pi)*sin(2*pi*theta)");
        var state = new[] { 0.0 };
        var next = new double[1];
        const int steps = 1000;
        for (var i = 0; i < steps; i++)
        {
            lift.Evaluate(state, [0.5, 1], 0, next);
            state[0] = next[0];
        }

        Tolerance.Close(0.5, state[0] / steps, Tolerance.Rounding, "winding number");
    }

    // In the Ω ≈ 0 tongue (Ω < K/2π) a stable fixed point exists where sin 2πθ = 2πΩ/K: mode locking at 0/1.
    [Fact]
    public void Analyze_LocksToFixedPoint_InsideZeroTongue()
    {
        var result = At(0.05, 0.9);
        Assert.Equal(Regime.FixedPoint, result.Regime);
        var theta = result.Cycle[0][0];
        Tolerance.Close(2 * Math.PI * 0.05 / 0.9, Math.Sin(2 * Math.PI * theta), 1e-9, "sin 2πθ*");
    }
}
