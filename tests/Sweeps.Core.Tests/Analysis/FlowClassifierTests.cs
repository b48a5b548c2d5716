using Sweeps.Core.Analysis;

namespace Sweeps.Core.Tests.Analysis;

public sealed class FlowClassifierTests
{
    private static readonly AnalysisSettings Settings = new(ZeroBand: 5e-3, Tolerance: 1e-6);

    // Exact: a bounded, non-stationary orbit of an autonomous flow has one zero exponent (the flow
    // direction), so a three-variable autonomous flow has at most one positive exponent: finite-time
    // noise on the zero one must not turn chaos into hyperchaos.
    [Fact]
    public void Decide_TreatsTheExponentNearestZeroAsTheFlowDirection_ForAutonomousFlows()
    {
        var verdict = FlowClassifier.Decide(new FlowMeasurements(3, false, false, 0, 100, [0.9, 0.008, -14.5], [0.01, 0.001, 0.01]), Settings);
        Assert.Equal(Regime.Chaotic, verdict.Regime);
    }

    [Fact]
    public void Decide_FindsHyperchaos_OnlyWithTwoPositiveBesidesTheFlowDirection()
    {
        var four = FlowClassifier.Decide(new FlowMeasurements(4, false, false, 0, 100, [0.3, 0.1, 0.0001, -20], [0.001, 0.001, 0.001, 0.01]), Settings);
        Assert.Equal(Regime.Hyperchaotic, four.Regime);
    }

    [Fact]
    public void Decide_CallsTwoZeroExponentsQuasiPeriodic_ForAutonomousFlows()
    {
        var torus = FlowClassifier.Decide(new FlowMeasurements(3, false, false, 0, 100, [0.001, -0.0005, -2], [0.001, 0.001, 0.01]), Settings);
        Assert.Equal(Regime.QuasiPeriodic, torus.Regime);
    }

    [Fact]
    public void Decide_RefusesAnUnstableRestState()
    {
        var verdict = FlowClassifier.Decide(new FlowMeasurements(1, false, true, 0, 0, [1.0], [0.0]), Settings);
        Assert.Equal(Regime.Unresolved, verdict.Regime);
        Assert.Contains("unstable equilibrium", verdict.Reason);
    }
}
