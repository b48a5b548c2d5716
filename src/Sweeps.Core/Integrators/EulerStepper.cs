namespace Sweeps.Core.Integrators;

/// <summary>Explicit Euler, first order: for comparisons and teaching-grade checks, not for sweeps.</summary>
public sealed class EulerStepper(OdeSystem system, double step) : FixedStepper(system, step)
{
    private readonly FixedStep? generated = system.Generated ? FlowKernels.Step(system.Model, system.TangentVectors, IntegratorMethod.Euler) : null;

    protected override void TakeStep(double[] y, double t, double h, double[] slope)
    {
        if (generated is not null)
        {
            generated(y, System.Parameters, t, h, slope);
            return;
        }

        System.Derivative(t, y, slope);
        for (var i = 0; i < y.Length; i++)
        {
            y[i] += h * slope[i];
        }
    }
}
