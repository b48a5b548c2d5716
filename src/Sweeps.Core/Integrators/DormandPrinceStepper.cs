using System.Runtime.CompilerServices;
namespace Sweeps.Core.Integrators;

/// <summary>
/// The Dormand–Prince 5(4) embedded pair (Dormand &amp; Prince, J. Comput. Appl. Math. 6 (1980) 19–26)
/// with first-same-as-last stages, step-size control on the mixed error norm
/// max_i |err_i| / (atol + rtol·max(|y_i|, |y_new_i|)), and the pair's fourth-order continuous
/// extension for dense output (coefficients as in Hairer, Nørsett &amp; Wanner, Solving ODEs I, §II.6).
/// When the system is <see cref="OdeSystem.Generated"/>, the six stages are one generated delegate
/// (<see cref="DormandPrinceKernel"/>) doing the loops' operations in their order.
/// </summary>
public sealed class DormandPrinceStepper : Stepper
{
    // Butcher tableau.
    internal const double C2 = 1.0 / 5, C3 = 3.0 / 10, C4 = 4.0 / 5, C5 = 8.0 / 9;
    internal const double A21 = 1.0 / 5;
    internal const double A31 = 3.0 / 40, A32 = 9.0 / 40;
    internal const double A41 = 44.0 / 45, A42 = -56.0 / 15, A43 = 32.0 / 9;
    internal const double A51 = 19372.0 / 6561, A52 = -25360.0 / 2187, A53 = 64448.0 / 6561, A54 = -212.0 / 729;
    internal const double A61 = 9017.0 / 3168, A62 = -355.0 / 33, A63 = 46732.0 / 5247, A64 = 49.0 / 176, A65 = -5103.0 / 18656;
    internal const double A71 = 35.0 / 384, A73 = 500.0 / 1113, A74 = 125.0 / 192, A75 = -2187.0 / 6784, A76 = 11.0 / 84;

    // Fifth-order weights minus fourth-order weights: the local error estimate.
    internal const double E1 = 71.0 / 57600, E3 = -71.0 / 16695, E4 = 71.0 / 1920, E5 = -17253.0 / 339200, E6 = 22.0 / 525, E7 = -1.0 / 40;

    // Continuous extension.
    private const double D1 = -12715105075.0 / 11282082432, D3 = 87487479700.0 / 32700410799, D4 = -10690763975.0 / 1880347072;
    private const double D5 = 701980252875.0 / 199316789632, D6 = -1453857185.0 / 822651844, D7 = 69997945.0 / 29380423;

    private readonly IntegratorSettings settings;
    private readonly DormandPrinceStages? generated;
    private readonly double[] k2, k3, k4, k5, k6, stage, next;

    // The slopes at the start (k1) and the end (k7) of a step. On acceptance they trade places instead of being copied
    // (first same as last): k1 then holds the new step's start slope, k7 the last step's until the next trial.
    private double[] k1, k7;

    // The dense output of the last accepted step is prepared only when asked for: forced flows sample at step ends
    // and autonomous ones interpolate only around a section crossing.
    private double denseStep;
    private bool densePending;
    private readonly Dense dense;
    private double step;
    private bool slopeKnown;

    public DormandPrinceStepper(OdeSystem system, IntegratorSettings settings)
        : base(system)
    {
        this.settings = settings;
        var n = system.Dimension;
        (k1, k2, k3, k4, k5, k6, k7, stage, next) = (new double[n], new double[n], new double[n], new double[n], new double[n], new double[n], new double[n], new double[n], new double[n]);
        dense = new Dense(n);
        step = settings.Step;
        generated = system.Generated ? DormandPrinceKernel.Stages(system.Model, system.TangentVectors) : null;
    }

    /// <summary>Accepted steps and rejected trial steps since the last reset.</summary>
    public long Accepted { get; private set; }

    public long Rejected { get; private set; }

    public override void StateChanged() => slopeKnown = false;

    public override void Reset()
    {
        step = settings.Step;
        slopeKnown = false;
        densePending = false;
        Accepted = 0;
        Rejected = 0;
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public override bool Advance(double[] y, ref double t, double limit)
    {
        var n = y.Length;
        densePending = false;
        if (!slopeKnown)
        {
            System.Derivative(t, y, k1);
            slopeKnown = true;
        }

        while (true)
        {
            var h = Math.Min(step, limit - t);
            if (!(h > 0))
            {
                return Fail(y, "no time left to step");
            }

            if (h < settings.MinStep && limit - t > settings.MinStep)
            {
                return Fail(y, MinStepFailure(settings.MinStep, t));
            }

            var error = Trial(y, t, h);
            if (!double.IsFinite(error))
            {
                // Treat a non-finite trial like a failed one: shrink hard and try again.
                step = h * 0.1;
                Rejected++;
                continue;
            }

            if (error <= 1.0)
            {
                Array.Copy(y, Start, n);
                StartTime = t;
                t = h == limit - t ? limit : t + h;
                EndTime = t;
                (denseStep, densePending) = (h, true);
                Array.Copy(next, y, n);
                (k1, k7) = (k7, k1);
                Accepted++;
                step = Math.Min(settings.MaxStep, h * StepControl.Growth(error));
                return true;
            }

            Rejected++;
            step = h * StepControl.Shrinkage(error);
        }
    }

    /// <summary>Why a step below the smallest allowed one cannot be taken.</summary>
    internal static string MinStepFailure(double minStep, double t) => $"step size fell below {minStep:g3} at t = {t:g6} (stiff or singular)";

    public override void Interpolate(double theta, double[] output, int count)
    {
        if (densePending)
        {
            // The slopes have traded places: k7 holds the step's start slope, k1 its end slope.
            dense.Prepare(denseStep, Start, next, k7, k3, k4, k5, k6, k1);
            densePending = false;
        }

        dense.Interpolate(theta, output, count);
    }

    /// <summary>A step that cannot be taken starts from the current state: that is the failed step's start.</summary>
    private bool Fail(double[] y, string failure)
    {
        Array.Copy(y, Start, y.Length);
        Failure = failure;
        return false;
    }

    /// <summary>One trial step: the stages, then the error norm (both generated in one delegate when the system is).</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private double Trial(double[] y, double t, double h)
    {
        if (generated is not null)
        {
            return generated(y, System.Parameters, t, h, k1, k2, k3, k4, k5, k6, k7, next, settings.AbsoluteTolerance, settings.RelativeTolerance);
        }

        Stages(y, t, h);
        return ErrorNorm(y, h);
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Stages(double[] y, double t, double h)
    {
        var n = y.Length;
        for (var i = 0; i < n; i++)
        {
            stage[i] = y[i] + (h * A21 * k1[i]);
        }

        System.Derivative(t + (C2 * h), stage, k2);
        for (var i = 0; i < n; i++)
        {
            stage[i] = y[i] + (h * ((A31 * k1[i]) + (A32 * k2[i])));
        }

        System.Derivative(t + (C3 * h), stage, k3);
        for (var i = 0; i < n; i++)
        {
            stage[i] = y[i] + (h * ((A41 * k1[i]) + (A42 * k2[i]) + (A43 * k3[i])));
        }

        System.Derivative(t + (C4 * h), stage, k4);
        for (var i = 0; i < n; i++)
        {
            stage[i] = y[i] + (h * ((A51 * k1[i]) + (A52 * k2[i]) + (A53 * k3[i]) + (A54 * k4[i])));
        }

        System.Derivative(t + (C5 * h), stage, k5);
        for (var i = 0; i < n; i++)
        {
            stage[i] = y[i] + (h * ((A61 * k1[i]) + (A62 * k2[i]) + (A63 * k3[i]) + (A64 * k4[i]) + (A65 * k5[i])));
        }

        System.Derivative(t + h, stage, k6);
        for (var i = 0; i < n; i++)
        {
            next[i] = y[i] + (h * ((A71 * k1[i]) + (A73 * k3[i]) + (A74 * k4[i]) + (A75 * k5[i]) + (A76 * k6[i])));
        }

        System.Derivative(t + h, next, k7);
    }

    /// <summary>The largest scaled error component; NaN or ∞ when the trial step produced non-finite values.</summary>
    private double ErrorNorm(double[] y, double h)
    {
        var worst = 0.0;
        for (var i = 0; i < y.Length; i++)
        {
            var estimate = h * ((E1 * k1[i]) + (E3 * k3[i]) + (E4 * k4[i]) + (E5 * k5[i]) + (E6 * k6[i]) + (E7 * k7[i]));
            var scale = settings.AbsoluteTolerance + (settings.RelativeTolerance * Math.Max(Math.Abs(y[i]), Math.Abs(next[i])));
            var ratio = Math.Abs(estimate) / scale;
            if (double.IsNaN(ratio))
            {
                return double.NaN;
            }

            worst = Math.Max(worst, ratio);
        }

        return worst;
    }

    /// <summary>
    /// The continuous extension of one accepted step, from its start and end states and its stages (shared with the
    /// lane-parallel analyzer, which prepares it for one lane).
    /// </summary>
    internal sealed class Dense(int n)
    {
        private readonly double[] r1 = new double[n], r2 = new double[n], r3 = new double[n], r4 = new double[n], r5 = new double[n];

        public void Prepare(double h, double[] y, double[] next, double[] startSlope, double[] k3, double[] k4, double[] k5, double[] k6, double[] endSlope)
        {
            for (var i = 0; i < r1.Length; i++)
            {
                var difference = next[i] - y[i];
                var b = (h * startSlope[i]) - difference;
                r1[i] = y[i];
                r2[i] = difference;
                r3[i] = b;
                r4[i] = difference - (h * endSlope[i]) - b;
                r5[i] = h * ((D1 * startSlope[i]) + (D3 * k3[i]) + (D4 * k4[i]) + (D5 * k5[i]) + (D6 * k6[i]) + (D7 * endSlope[i]));
            }
        }

        public void Interpolate(double theta, double[] output, int count)
        {
            var rest = 1 - theta;
            for (var i = 0; i < count; i++)
            {
                output[i] = r1[i] + (theta * (r2[i] + (rest * (r3[i] + (theta * (r4[i] + (rest * r5[i])))))));
            }
        }
    }
}
