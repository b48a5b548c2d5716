using System.Runtime.CompilerServices;
using Sweeps.Core.Expressions;
using Sweeps.Core.Models;

namespace Sweeps.Core.Integrators;

/// <summary>
/// The right-hand side an integrator advances: a flow's state x (n values) and, when
/// <see cref="TangentVectors"/> k &gt; 0, k tangent vectors Φ that obey the variational equation
/// dΦ/dt = Df(x, t)·Φ with the model's exact symbolic Jacobian. The augmented vector is
/// [x, Φ₁, …, Φ_k]. Buffers are owned here; one instance per thread.
/// </summary>
public sealed class OdeSystem
{
    private readonly double[] x;
    private readonly double[] f;
    private readonly double[] jacobian;
    private readonly VectorField? fused;

    /// <param name="model">The flow.</param>
    /// <param name="tangentVectors">Tangent vectors k carried beside the state.</param>
    /// <param name="generated">
    /// Evaluate through run-time generated code (<see cref="FlowKernels"/>): one fused delegate for f and Df·Φ,
    /// and whole generated steps for the fixed-step schemes. False keeps the plain reference loops, which the
    /// generated code is tested against.
    /// </param>
    public OdeSystem(Model model, int tangentVectors, bool generated = true)
    {
        Model = model;
        StateDimension = model.Dimension;
        TangentVectors = tangentVectors;
        Generated = generated;
        Dimension = StateDimension * (1 + tangentVectors);
        x = new double[StateDimension];
        f = new double[StateDimension];
        jacobian = new double[StateDimension * StateDimension];
        fused = generated && tangentVectors > 0 ? FlowKernels.Derivative(model, tangentVectors) : null;
    }

    public Model Model { get; }

    /// <summary>Whether evaluation runs through generated code (see the constructor).</summary>
    public bool Generated { get; }

    public int StateDimension { get; }

    public int TangentVectors { get; }

    /// <summary>Length of the augmented vector.</summary>
    public int Dimension { get; }

    /// <summary>The parameters the right-hand side is evaluated with.</summary>
    public double[] Parameters { get; set; } = [];

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Derivative(double t, double[] y, double[] dy)
    {
        var n = StateDimension;
        if (TangentVectors == 0)
        {
            Model.Evaluate(y, Parameters, t, dy);
            return;
        }

        if (fused is not null)
        {
            fused(y, Parameters, t, dy);
            return;
        }

        Array.Copy(y, x, n);
        Model.Evaluate(x, Parameters, t, f);
        Array.Copy(f, dy, n);
        Model.EvaluateJacobian(x, Parameters, t, jacobian);
        for (var c = 0; c < TangentVectors; c++)
        {
            var offset = n * (c + 1);
            for (var i = 0; i < n; i++)
            {
                var sum = 0.0;
                for (var j = 0; j < n; j++)
                {
                    sum += jacobian[(i * n) + j] * y[offset + j];
                }

                dy[offset + i] = sum;
            }
        }
    }

    /// <summary>∇·f = tr Df at (t, state); the state is the first n entries of <paramref name="y"/>.</summary>
    public double Divergence(double t, double[] y)
    {
        Array.Copy(y, x, StateDimension);
        Model.EvaluateJacobian(x, Parameters, t, jacobian);
        var trace = 0.0;
        for (var i = 0; i < StateDimension; i++)
        {
            trace += jacobian[(i * StateDimension) + i];
        }

        return trace;
    }
}
