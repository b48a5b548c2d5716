using Sweeps.Core.Analysis;
using Sweeps.Core.Integrators;
using Sweeps.Core.Kernels;
using Sweeps.Core.Models;

namespace Sweeps.Core.Tests.Kernels;

/// <summary>
/// The lane-parallel flow analyzer against the scalar one: for every point of a block, the same result bit
/// for bit — regime, period and its duration, exponents and their errors, mean divergence, final state, section
/// points, box, indicators and reason — for autonomous flows with section crossings, forced flows sampled
/// stroboscopically, points that escape or blow up part-way while their neighbours go on, every Lyapunov mode,
/// both fixed-step schemes, and blocks with fewer points than lanes.
/// </summary>
public sealed class FlowBlockAnalyzerTests
{
    internal static readonly Model Lorenz = Maps.Build(ModelKind.Flow, ["x", "y", "z"], ["sigma", "rho", "beta"], "sigma*(y - x)", "x*(rho - z) - y", "x*y - beta*z");

    // A forced hardening oscillator (stroboscopic samples at the forcing period).
    internal static readonly Model Forced = Build(
        new ModelSource(ModelKind.Flow, ["x", "v"], ["delta", "gamma"], ["v", "-delta*v - x - x^3 + gamma*cos(1.2*t)"]) { ForcingPeriod = 2 * Math.PI / 1.2 });

    // Blows up in finite time for a > 0 (x' = a·x²), settles for a < 0: escapes and step failures among live lanes.
    internal static readonly Model Runaway = Maps.Build(ModelKind.Flow, ["x", "w"], ["a"], "a*x^2 - 0.1*x", "-w + sin(x)");

    [Fact]
    public void Lorenz_GivesTheScalarResults_WithSectionsAndEveryLyapunovMode()
    {
        foreach (var mode in new[] { LyapunovMode.Spectrum, LyapunovMode.Largest, LyapunovMode.None })
        {
            var settings = new AnalysisSettings(Transient: 10, Measure: 30, Lyapunov: mode, MaxPeriod: 16, Tolerance: 1e-5, Samples: 6, ZeroBand: 5e-3);
            Compare(Lorenz, settings, new IntegratorSettings(IntegratorMethod.Rk4, 0.01), new SectionSettings(), 11, k => [10, 0.5 + (17.0 * k), 8.0 / 3], [1, 1, 1]);
        }
    }

    [Fact]
    public void Lorenz_GivesTheScalarResults_WithEulerAFixedLevelAndBothDirections()
    {
        var settings = new AnalysisSettings(Transient: 5, Measure: 20, MaxPeriod: 8, Tolerance: 1e-5, Samples: 4, ZeroBand: 5e-3, Indicators: true);
        Compare(Lorenz, settings, new IntegratorSettings(IntegratorMethod.Euler, 0.002), new SectionSettings(2, 25, SectionDirection.Both), 6, k => [10, 20 + (40.0 * k), 8.0 / 3], [1, 1, 1]);
    }

    [Fact]
    public void ForcedFlow_GivesTheScalarResults_AtTheForcingPeriods()
    {
        var settings = new AnalysisSettings(Transient: 60, Measure: 120, MaxPeriod: 8, Tolerance: 1e-6, Samples: 8, ZeroBand: 5e-3);
        Compare(Forced, settings, new IntegratorSettings(IntegratorMethod.Rk4, 0.01), new SectionSettings(), 24, k => [0.05 + (0.1 * (k % 4)), 0.2 + (1.5 * (k / 4))], [0, 0]);
    }

    [Fact]
    public void RunawayPoints_StopAloneAndTheirNeighboursGoOn()
    {
        // Escapes in the measurement (no transient), and overflow to non-finite values in the transient (a huge escape bound).
        var settings = new AnalysisSettings(Transient: 0, Measure: 10, MaxPeriod: 8, Tolerance: 1e-6, Samples: 4, Escape: 1e8, ZeroBand: 5e-3);
        Compare(Runaway, settings, new IntegratorSettings(IntegratorMethod.Rk4, 0.01), new SectionSettings(), 10, k => [(k % 3) - 1 + (0.01 * k)], [1.5, 0.2]);
        Compare(Runaway, settings with { Transient = 4, Escape = 1e300 }, new IntegratorSettings(IntegratorMethod.Rk4, 0.01), new SectionSettings(), 10, k => [(k % 3) - 1 + (0.01 * k)], [1.5, 0.2], outcomes: 1);

        // A step budget that ends every point in the measurement.
        var budget = new IntegratorSettings(IntegratorMethod.Rk4, 0.01, MaxSteps: 700);
        Compare(Lorenz, new AnalysisSettings(Transient: 5, Measure: 10, ZeroBand: 5e-3), budget, new SectionSettings(), 3, k => [10, 28 + k, 8.0 / 3], [1, 1, 1], outcomes: 1);
    }

    [Theory]
    [InlineData(IntegratorMethod.Rk4)]
    [InlineData(IntegratorMethod.Dopri5)]
    public void Stepping_AllocatesNothingPerStep_OnEitherIntegrator(IntegratorMethod method)
    {
        // Four times the measurement, the same allocations: what a block allocates belongs to its results, not to its
        // steps (a closure per step once cost 19 bytes per point and step, 380 KB per Lorenz-type point).
        var integrator = new IntegratorSettings(method, 0.01);
        long Allocated(long measure)
        {
            var settings = new AnalysisSettings(Transient: 5, Measure: measure, Lyapunov: LyapunovMode.Spectrum, MaxPeriod: 16, Tolerance: 1e-5, Samples: 6, ZeroBand: 5e-3);
            var block = BlockAnalyzers.Create(Lorenz, settings, integrator, new SectionSettings())!;
            var size = block.BlockSize;
            var initial = Enumerable.Range(0, size).Select(_ => new double[] { 1, 1, 1 }).ToArray();
            var parameters = Enumerable.Range(0, size).Select(k => new double[] { 10, 24 + k, 8.0 / 3 }).ToArray();
            var results = new PointResult[size];
            block.Analyze(initial, parameters, size, results);
            var before = GC.GetAllocatedBytesForCurrentThread();
            block.Analyze(initial, parameters, size, results);
            return GC.GetAllocatedBytesForCurrentThread() - before;
        }

        var (shorter, longer) = (Allocated(10), Allocated(40));
        var steps = (int)(30 / 0.01);
        Assert.True(longer - shorter < steps, $"{longer - shorter} more bytes for {steps} more steps of a block ({shorter} bytes in all for the shorter run)");
    }

    /// <summary>
    /// Runs the points through the block analyzer chosen for the integrator (of type <typeparamref name="TBlock"/>) block
    /// by block, and each point through the scalar analyzer; the results must agree bit for bit.
    /// </summary>
    internal static void Compare<TBlock>(Model model, AnalysisSettings settings, IntegratorSettings integrator, SectionSettings section, int points, Func<int, double[]> parametersOf, double[] start, int outcomes = 2)
        where TBlock : IBlockAnalyzer
    {
        var block = Assert.IsType<TBlock>(BlockAnalyzers.Create(model, settings, integrator, section));
        var reference = new FlowAnalyzer(model, settings, integrator, section);
        var size = block.BlockSize;
        var (initial, parameters, results) = (new double[size][], new double[size][], new PointResult[size]);
        var regimes = new HashSet<Regime>();
        var reasons = new HashSet<string?>();
        for (var first = 0; first < points; first += size)
        {
            var count = Math.Min(size, points - first);
            for (var i = 0; i < count; i++)
            {
                initial[i] = start;
                parameters[i] = parametersOf(first + i);
            }

            block.Analyze(initial, parameters, count, results);
            for (var i = 0; i < count; i++)
            {
                var expected = reference.Analyze(initial[i], parameters[i]);
                SameResult.Check(expected, results[i], $"{string.Join(", ", parameters[i])}, {settings.Lyapunov}, {integrator.Method}");
                regimes.Add(expected.Regime);
                reasons.Add(expected.Reason);
            }
        }

        // The cases are chosen to mix outcomes inside one block; a block of one outcome would test less.
        Assert.True(regimes.Count >= outcomes, $"only {string.Join(", ", regimes)}: {string.Join("; ", reasons)}");
    }

    private static void Compare(Model model, AnalysisSettings settings, IntegratorSettings integrator, SectionSettings section, int points, Func<int, double[]> parametersOf, double[] start, int outcomes = 2) =>
        Compare<FlowBlockAnalyzer>(model, settings, integrator, section, points, parametersOf, start, outcomes);

    internal static Model Build(ModelSource source) =>
        Model.TryBuild(source, out var model, out var errors) ? model! : throw new InvalidOperationException(string.Join("; ", errors));
}
