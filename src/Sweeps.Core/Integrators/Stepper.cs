namespace Sweeps.Core.Integrators;

/// <summary>
/// One-step integrators over an <see cref="OdeSystem"/>. After each successful <see cref="Advance"/>,
/// <see cref="Interpolate"/> evaluates the solution anywhere inside the step just taken (dense
/// output), which is how section crossings and stroboscopic samples are located between steps.
/// The steppers are sealed and own their stage buffers; one call per step, no allocation.
/// </summary>
public abstract class Stepper : IDenseOutput
{
    protected Stepper(OdeSystem system)
    {
        System = system;
        Start = new double[system.Dimension];
    }

    public OdeSystem System { get; }

    /// <summary>Time and state at the start of the last step.</summary>
    public double StartTime { get; protected set; }

    public double[] Start { get; }

    /// <summary>Time at the end of the last step.</summary>
    public double EndTime { get; protected set; }

    /// <summary>Why the last <see cref="Advance"/> failed, if it did.</summary>
    public string? Failure { get; protected set; }

    public static Stepper Create(OdeSystem system, IntegratorSettings settings) => settings.Method switch
    {
        IntegratorMethod.Euler => new EulerStepper(system, settings.Step),
        IntegratorMethod.Rk4 => new Rk4Stepper(system, settings.Step),
        _ => new DormandPrinceStepper(system, settings),
    };

    /// <summary>
    /// Tells the stepper that the caller changed y between steps (the tangent vectors are
    /// re-orthonormalised), so a slope kept from the last step (first-same-as-last) is stale.
    /// </summary>
    public virtual void StateChanged()
    {
    }

    /// <summary>Resets per-orbit state (adaptive step memory) before a new point.</summary>
    public virtual void Reset()
    {
    }

    /// <summary>
    /// Advances <paramref name="y"/> from <paramref name="t"/> by one step, never past
    /// <paramref name="limit"/> (so that a phase ends exactly on time). Returns false when the step
    /// cannot be taken (step size below the minimum, non-finite values); <see cref="Failure"/> says why.
    /// </summary>
    public abstract bool Advance(double[] y, ref double t, double limit);

    /// <summary>The solution at StartTime + θ·(EndTime − StartTime), θ ∈ [0, 1], into <paramref name="output"/> (first <paramref name="count"/> entries).</summary>
    public abstract void Interpolate(double theta, double[] output, int count);

    /// <summary>The solution at time <paramref name="time"/> inside the last step.</summary>
    public void InterpolateAt(double time, double[] output, int count)
    {
        var width = EndTime - StartTime;
        Interpolate(width > 0 ? Math.Clamp((time - StartTime) / width, 0, 1) : 1, output, count);
    }
}
