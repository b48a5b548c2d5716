using System.Runtime.CompilerServices;
namespace Sweeps.Core.Integrators;

/// <summary>
/// The classical fourth-order Runge–Kutta scheme with a fixed step. Each stage is evaluated at its
/// own time (t, t + h/2, t + h/2, t + h), which matters for forced systems. When the system is
/// <see cref="OdeSystem.Generated"/>, the whole step is one generated delegate (<see cref="FlowKernels"/>)
/// doing these operations in this order; the loops below are the reference it is tested against.
/// </summary>
public sealed class Rk4Stepper : FixedStepper
{
    private readonly double[] k2;
    private readonly double[] k3;
    private readonly double[] k4;
    private readonly double[] stage;
    private readonly FixedStep? generated;

    public Rk4Stepper(OdeSystem system, double step)
        : base(system, step)
    {
        k2 = new double[system.Dimension];
        k3 = new double[system.Dimension];
        k4 = new double[system.Dimension];
        stage = new double[system.Dimension];
        generated = system.Generated ? FlowKernels.Step(system.Model, system.TangentVectors, IntegratorMethod.Rk4) : null;
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    protected override void TakeStep(double[] y, double t, double h, double[] k1)
    {
        if (generated is not null)
        {
            generated(y, System.Parameters, t, h, k1);
            return;
        }

        var n = y.Length;
        System.Derivative(t, y, k1);
        for (var i = 0; i < n; i++)
        {
            stage[i] = y[i] + (0.5 * h * k1[i]);
        }

        System.Derivative(t + (0.5 * h), stage, k2);
        for (var i = 0; i < n; i++)
        {
            stage[i] = y[i] + (0.5 * h * k2[i]);
        }

        System.Derivative(t + (0.5 * h), stage, k3);
        for (var i = 0; i < n; i++)
        {
            stage[i] = y[i] + (h * k3[i]);
        }

        System.Derivative(t + h, stage, k4);
        for (var i = 0; i < n; i++)
        {
            y[i] += h / 6 * (k1[i] + (2 * k2[i]) + (2 * k3[i]) + k4[i]);
        }
    }
}
