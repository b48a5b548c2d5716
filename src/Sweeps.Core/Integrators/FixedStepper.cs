namespace Sweeps.Core.Integrators;

/// <summary>
/// Shared part of the fixed-step schemes: the step, and cubic Hermite dense output from the state
/// and slope at both ends of the step (third-order accurate, enough to place a crossing inside a
/// step far more precisely than the step's end points).
/// </summary>
public abstract class FixedStepper : Stepper
{
    private readonly double[] startSlope;
    private readonly double[] endSlope;
    private readonly double[] end;
    private bool endSlopeKnown;

    protected FixedStepper(OdeSystem system, double step)
        : base(system)
    {
        Step = step;
        startSlope = new double[system.Dimension];
        endSlope = new double[system.Dimension];
        end = new double[system.Dimension];
    }

    public double Step { get; }

    public sealed override bool Advance(double[] y, ref double t, double limit)
    {
        var h = Math.Min(Step, limit - t);
        if (!(h > 0))
        {
            Failure = "no time left to step";
            return false;
        }

        Array.Copy(y, Start, y.Length);
        StartTime = t;
        TakeStep(y, t, h, startSlope);
        t = limit - t <= Step ? limit : t + h;
        EndTime = t;
        Array.Copy(y, end, y.Length);
        endSlopeKnown = false;
        for (var i = 0; i < y.Length; i++)
        {
            if (!double.IsFinite(y[i]))
            {
                Failure = $"non-finite value at t = {t:g6}";
                return false;
            }
        }

        return true;
    }

    public sealed override void Interpolate(double theta, double[] output, int count)
    {
        if (!endSlopeKnown)
        {
            System.Derivative(EndTime, end, endSlope);
            endSlopeKnown = true;
        }

        Hermite(theta, EndTime - StartTime, Start, startSlope, end, endSlope, output, count);
    }

    /// <summary>The cubic Hermite interpolant at θ of a step of length <paramref name="h"/> from its end values and slopes.</summary>
    internal static void Hermite(double theta, double h, double[] start, double[] startSlope, double[] end, double[] endSlope, double[] output, int count)
    {
        var t2 = theta * theta;
        var t3 = t2 * theta;
        var h00 = (2 * t3) - (3 * t2) + 1;
        var h10 = t3 - (2 * t2) + theta;
        var h01 = (-2 * t3) + (3 * t2);
        var h11 = t3 - t2;
        for (var i = 0; i < count; i++)
        {
            output[i] = (h00 * start[i]) + (h10 * h * startSlope[i]) + (h01 * end[i]) + (h11 * h * endSlope[i]);
        }
    }

    /// <summary>Advances y from t by h in place; <paramref name="slope"/> receives f(t, y) at the start.</summary>
    protected abstract void TakeStep(double[] y, double t, double h, double[] slope);
}
