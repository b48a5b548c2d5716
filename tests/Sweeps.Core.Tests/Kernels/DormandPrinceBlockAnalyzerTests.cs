using Sweeps.Core.Analysis;
using Sweeps.Core.Integrators;
using Sweeps.Core.Kernels;
using Sweeps.Core.Models;
using static Sweeps.Core.Tests.Kernels.FlowBlockAnalyzerTests;

namespace Sweeps.Core.Tests.Kernels;

/// <summary>
/// The lane-parallel Dormand–Prince analyzer against the scalar one: four points with their own times and step sizes
/// (accepted and rejected trials out of step with each other), and for every point the same result bit for bit —
/// regime, period and its duration, exponents and their errors, mean divergence, final state, section points, box,
/// indicators and reason. Autonomous flows with crossings located on each lane's dense output, forced flows sampled at
/// the forcing periods, points that escape, blow up (the step collapses) or use up the step budget while their
/// neighbours go on, every Lyapunov mode, and blocks with fewer points than lanes.
/// </summary>
public sealed class DormandPrinceBlockAnalyzerTests
{
    private static readonly IntegratorSettings Adaptive = new(IntegratorMethod.Dopri5, RelativeTolerance: 1e-8, AbsoluteTolerance: 1e-10);

    [Fact]
    public void Lorenz_GivesTheScalarResults_WithSectionsAndEveryLyapunovMode()
    {
        // ρ from a stable equilibrium (steps grow to the largest) to chaos (small steps): the lanes' clocks drift apart.
        foreach (var mode in new[] { LyapunovMode.Spectrum, LyapunovMode.Largest, LyapunovMode.None })
        {
            var settings = new AnalysisSettings(Transient: 10, Measure: 30, Lyapunov: mode, MaxPeriod: 16, Tolerance: 1e-5, Samples: 6, ZeroBand: 5e-3);
            Compare<DormandPrinceBlockAnalyzer>(Lorenz, settings, Adaptive, new SectionSettings(), 11, k => [10, 0.5 + (17.0 * k), 8.0 / 3], [1, 1, 1]);
        }
    }

    [Fact]
    public void Lorenz_GivesTheScalarResults_WithAFixedLevelBothDirectionsAndIndicators()
    {
        var settings = new AnalysisSettings(Transient: 5, Measure: 20, MaxPeriod: 8, Tolerance: 1e-5, Samples: 4, ZeroBand: 5e-3, Indicators: true);
        Compare<DormandPrinceBlockAnalyzer>(Lorenz, settings, Adaptive with { MaxStep = 0.05 }, new SectionSettings(2, 25, SectionDirection.Both), 6, k => [10, 20 + (40.0 * k), 8.0 / 3], [1, 1, 1]);
    }

    [Fact]
    public void ForcedFlow_GivesTheScalarResults_AtTheForcingPeriods()
    {
        var settings = new AnalysisSettings(Transient: 60, Measure: 120, MaxPeriod: 8, Tolerance: 1e-6, Samples: 8, ZeroBand: 5e-3);
        Compare<DormandPrinceBlockAnalyzer>(Forced, settings, Adaptive, new SectionSettings(), 22, k => [0.05 + (0.1 * (k % 4)), 0.2 + (1.5 * (k / 4))], [0, 0]);
        Compare<DormandPrinceBlockAnalyzer>(Forced, settings with { Transient = 0, Lyapunov = LyapunovMode.Largest }, Adaptive, new SectionSettings(), 7, k => [0.3, 0.4 + (0.3 * k)], [0.5, 0], outcomes: 1);

        // No time to measure (the analyzers themselves allow it; configs ask for at least two periods).
        Compare<DormandPrinceBlockAnalyzer>(Forced, settings with { Measure = 0 }, Adaptive, new SectionSettings(), 3, k => [0.3, 0.4 + (0.3 * k)], [0.5, 0], outcomes: 1);
    }

    [Fact]
    public void RunawayPoints_StopAloneAndTheirNeighboursGoOn()
    {
        // Escapes in the measurement (no transient) beside points that settle.
        var settings = new AnalysisSettings(Transient: 0, Measure: 10, MaxPeriod: 8, Tolerance: 1e-6, Samples: 4, Escape: 1e8, ZeroBand: 5e-3);
        Compare<DormandPrinceBlockAnalyzer>(Runaway, settings, Adaptive, new SectionSettings(), 10, k => [(k % 3) - 1 + (0.01 * k)], [1.5, 0.2]);

        // With a larger escape bound the step collapses before the bound is reached, far out: blown up, in the transient.
        Compare<DormandPrinceBlockAnalyzer>(Runaway, settings with { Transient = 4, Escape = 1e16 }, Adaptive, new SectionSettings(), 10, k => [(k % 3) - 1 + (0.01 * k)], [1.5, 0.2]);

        // A step budget that ends points in the transient and in the measurement, at different times per lane.
        var budget = Adaptive with { MaxSteps = 1500 };
        Compare<DormandPrinceBlockAnalyzer>(Lorenz, new AnalysisSettings(Transient: 5, Measure: 10, ZeroBand: 5e-3), budget, new SectionSettings(), 7, k => [10, 10 + (30.0 * k), 8.0 / 3], [1, 1, 1], outcomes: 1);
    }

    [Fact]
    public void StepSizeFloor_LeavesPointsUnresolved_LaneByLane()
    {
        // Below √escape when the step falls under the floor: unresolved at the failing step, beside points that decay
        // too slowly to be called at rest (unresolved at the end, for another reason).
        var settings = new AnalysisSettings(Transient: 4, Measure: 10, MaxPeriod: 8, Tolerance: 1e-6, Samples: 4, Escape: 1e300, ZeroBand: 5e-3);
        Compare<DormandPrinceBlockAnalyzer>(Runaway, settings, Adaptive with { MinStep = 1e-9 }, new SectionSettings(), 10, k => [(k % 3) - 1 + (0.01 * k)], [1.5, 0.2], outcomes: 1);
    }

    [Fact]
    public void NonFiniteTrials_ShrinkTheStep_LaneByLane()
    {
        // x' = −a·√x reaches 0 at t = 2/a: trial stages past it take √ of a negative number, so the error norm is NaN and
        // the step is cut tenfold, lane by lane, until the step floor; smaller a never get there.
        var model = Maps.Build(ModelKind.Flow, ["x", "w"], ["a"], "-a*sqrt(x)", "-w");
        var settings = new AnalysisSettings(Transient: 0, Measure: 3, Lyapunov: LyapunovMode.Largest, MaxPeriod: 8, Tolerance: 1e-6, ZeroBand: 5e-3);
        Compare<DormandPrinceBlockAnalyzer>(model, settings, Adaptive with { MinStep = 1e-9 }, new SectionSettings(), 9, k => [0.2 + (0.15 * k)], [1, 1], outcomes: 1);
    }
}
