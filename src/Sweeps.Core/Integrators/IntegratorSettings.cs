namespace Sweeps.Core.Integrators;

/// <summary>
/// How flows are integrated. <see cref="Step"/> is the fixed step of Euler and RK4 and the initial
/// step of Dormand–Prince, whose error per step is kept below atol + rtol·|y| component-wise.
/// </summary>
/// <param name="Method">The integration scheme.</param>
/// <param name="Step">Fixed step (Euler, RK4) or first trial step (Dormand–Prince).</param>
/// <param name="RelativeTolerance">Dormand–Prince relative error tolerance per step.</param>
/// <param name="AbsoluteTolerance">Dormand–Prince absolute error tolerance per step.</param>
/// <param name="MinStep">Dormand–Prince gives up (the point is unresolved) when the step falls below this.</param>
/// <param name="MaxStep">Largest Dormand–Prince step.</param>
/// <param name="MaxSteps">Budget of steps per point; a point over budget is unresolved, never a hung chunk.</param>
public sealed record IntegratorSettings(
    IntegratorMethod Method = IntegratorMethod.Dopri5,
    double Step = 0.01,
    double RelativeTolerance = 1e-9,
    double AbsoluteTolerance = 1e-12,
    double MinStep = 1e-12,
    double MaxStep = 1.0,
    long MaxSteps = 50_000_000);
