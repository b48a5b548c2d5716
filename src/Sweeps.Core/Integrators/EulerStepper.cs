namespace Sweeps.Core.Integrators;

/// <summary>Explicit Euler, first order: for comparisons and teaching-grade checks, not for sweeps.</summary>
public sealed class EulerStepper(OdeSystem system, double step) : FixedStepper(system, step)
{
    protected override void TakeStep(double[] y, double t, double h, double[] slope)
    {
        System.Derivative(t, y, slope);
        for (var i = 0; i < y.Length; i++)
        {
            y[i] += h * slope[i];
        }
    }
}
