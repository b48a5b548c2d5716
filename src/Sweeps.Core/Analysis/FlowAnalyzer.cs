using System.Globalization;
using System.Runtime.CompilerServices;
using Sweeps.Core.Integrators;
using Sweeps.Core.Models;

namespace Sweeps.Core.Analysis;

/// <summary>
/// Analyses points of an ODE flow: a transient integrated on the state alone, then a measured phase
/// on the state with its tangent vectors (variational equations, exact Jacobian) re-orthonormalised
/// by QR every <see cref="QrInterval"/> time units (Benettin et al., Meccanica 15, 1980), while
/// crossings of the Poincaré section are located on the integrator's dense output — or, for a forced
/// flow, the state is sampled once per forcing period (the stroboscopic map). The section points feed
/// the same period test as a map's orbit. One instance per thread; buffers are reused across points.
/// </summary>
public sealed class FlowAnalyzer : IPointAnalyzer
{
    /// <summary>
    /// Time between re-orthonormalisations. Over 0.1 time units tangent vectors separate by
    /// e^{0.1·(λ1 − λn)}, far from the 1e16 at which doubles lose the smaller directions for any
    /// spectrum narrower than a few hundred per unit time.
    /// </summary>
    public const double QrInterval = 0.1;

    private const int LocateIterations = 60;

    private readonly Model model;
    private readonly AnalysisSettings settings;
    private readonly IntegratorSettings integrator;
    private readonly SectionSettings section;
    private readonly int n;
    private readonly int vectors;
    private readonly double forcingPeriod;
    private readonly OdeSystem plain;
    private readonly OdeSystem tangent;
    private readonly Stepper plainStepper;
    private readonly Stepper tangentStepper;
    private readonly double[] state;
    private readonly double[] augmented;
    private readonly double[] probe;
    private readonly double[] slope;
    private readonly double[] norms;
    private readonly double[] sums;
    private readonly double[] firstHalf;
    private readonly double[] times;
    private readonly PeriodDetector detector;

    // The starting tangent frame is the same for every point: built once, copied per point.
    private readonly double[] frame;

    // Indicators: the last recorded values (section points or stroboscopic samples) of one variable, as a ring.
    private readonly double[] series;
    private readonly int seriesVariable;
    private long seriesCount;

    public FlowAnalyzer(Model model, AnalysisSettings settings, IntegratorSettings integrator, SectionSettings section)
        : this(model, settings, integrator, section, generated: true)
    {
    }

    private FlowAnalyzer(Model model, AnalysisSettings settings, IntegratorSettings integrator, SectionSettings section, bool generated)
    {
        if (model.Kind != ModelKind.Flow)
        {
            throw new ArgumentException("FlowAnalyzer needs a flow model", nameof(model));
        }

        this.model = model;
        this.settings = settings;
        this.integrator = integrator;
        this.section = section;
        n = model.Dimension;
        forcingPeriod = model.UsesTime ? model.Source.ForcingPeriod ?? throw new ArgumentException("a flow that uses t needs a forcing period") : 0;
        vectors = settings.Lyapunov switch
        {
            LyapunovMode.Spectrum => n,
            LyapunovMode.Largest => 1,
            _ => 0,
        };
        plain = new OdeSystem(model, 0, generated);
        tangent = new OdeSystem(model, vectors, generated);
        plainStepper = Stepper.Create(plain, integrator);
        tangentStepper = Stepper.Create(tangent, integrator);
        state = new double[n];
        augmented = new double[tangent.Dimension];
        probe = new double[tangent.Dimension];
        slope = new double[n];
        norms = new double[Math.Max(vectors, 1)];
        sums = new double[Math.Max(vectors, 1)];
        firstHalf = new double[Math.Max(vectors, 1)];
        times = new double[2 * settings.MaxPeriod];
        detector = new PeriodDetector(n, settings.MaxPeriod, settings.Tolerance);
        frame = TangentFrame.Initial(n, vectors);
        series = settings.Indicators ? new double[MapAnalyzer.IndicatorWindow] : [];

        // On a section its own variable is constant: watch the first other one.
        seriesVariable = model.UsesTime || n == 1 ? 0 : section.Variable == 0 ? 1 : 0;
    }

    /// <summary>The same analysis on the plain reference loops instead of generated code (for tests of the generated code).</summary>
    internal static FlowAnalyzer Reference(Model model, AnalysisSettings settings, IntegratorSettings integrator, SectionSettings section) =>
        new(model, settings, integrator, section, generated: false);

    /// <summary>Fewest recorded values the indicators are computed from; with fewer they are NaN.</summary>
    public const int IndicatorMinimum = 64;

    public bool Forced => forcingPeriod > 0;

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public PointResult Analyze(ReadOnlySpan<double> initial, double[] parameters)
    {
        initial.CopyTo(state);
        plain.Parameters = parameters;
        tangent.Parameters = parameters;
        plainStepper.Reset();
        tangentStepper.Reset();
        detector.Reset();
        seriesCount = 0;
        Array.Clear(sums);
        Array.Clear(firstHalf);
        if (!PointResult.Bounded(state, settings.Escape))
        {
            return Divergent(0, 0);
        }

        // Transient: the state alone; the section level defaults to the mean over its second half.
        var t = 0.0;
        var steps = 0L;
        var (meanSum, meanTime) = (0.0, 0.0);
        var transientEnd = (double)settings.Transient;
        while (t < transientEnd)
        {
            var before = t;
            if (!plainStepper.Advance(state, ref t, transientEnd))
            {
                return StepFailed(plainStepper, steps, t);
            }

            if (++steps > integrator.MaxSteps)
            {
                return Unresolved($"step budget of {integrator.MaxSteps} used up at t = {Format(t)}");
            }

            if (!PointResult.Bounded(state, settings.Escape))
            {
                return Divergent(steps, t);
            }

            if (before >= transientEnd / 2)
            {
                meanSum += state[section.Variable] * (t - before);
                meanTime += t - before;
            }
        }

        var level = section.Level ?? (meanTime > 0 ? meanSum / meanTime : state[section.Variable]);
        return Measure(t, steps, level);
    }

    private PointResult Measure(double t, long steps, double level)
    {
        Array.Copy(state, augmented, n);
        frame.CopyTo(augmented, n);
        var start = t;
        var end = start + settings.Measure;
        var half = start + (settings.Measure / 2.0);
        var halfTime = double.NaN;
        var strobe = Forced ? Math.Floor((t / forcingPeriod) + 1e-9) + 1 : 0;
        var lastQr = t;
        var crossings = 0L;
        var trace = 0.0;
        var traceBefore = vectors == n ? tangent.Divergence(t, augmented) : 0;
        var gBefore = augmented[section.Variable] - level;
        while (t < end)
        {
            // Steps end exactly on the next forcing period and on the middle of the measurement.
            var limit = Forced ? Math.Min(end, strobe * forcingPeriod) : end;
            if (double.IsNaN(halfTime) && t < half)
            {
                limit = Math.Min(limit, half);
            }

            if (!tangentStepper.Advance(augmented, ref t, limit))
            {
                Array.Copy(augmented, state, n);
                return StepFailed(tangentStepper, steps, t);
            }

            if (++steps > integrator.MaxSteps)
            {
                return Unresolved($"step budget of {integrator.MaxSteps} used up at t = {Format(t)}");
            }

            Array.Copy(augmented, state, n);
            if (!PointResult.Bounded(state, settings.Escape))
            {
                return Divergent(steps, t);
            }

            if (Forced)
            {
                if (t == strobe * forcingPeriod)
                {
                    Record(state, t);
                    crossings++;
                    strobe++;
                }
            }
            else
            {
                var gNow = augmented[section.Variable] - level;
                if (Crosses(gBefore, gNow))
                {
                    Record(Locate(gBefore, gNow, level, out var when), when);
                    crossings++;
                }

                gBefore = gNow;
            }

            var halfReached = double.IsNaN(halfTime) && t >= half;
            if (vectors > 0 && (t - lastQr >= QrInterval || halfReached || t >= end))
            {
                if (!Orthonormalizer.Orthonormalize(augmented.AsSpan(n, n * vectors), n, vectors, norms))
                {
                    return Unresolved($"non-finite tangent vector at t = {Format(t)}");
                }

                for (var c = 0; c < vectors; c++)
                {
                    sums[c] += Math.Log(norms[c]);
                }

                tangentStepper.StateChanged();

                // The divergence for the Σλ check, by the trapezoid rule between re-orthonormalisations:
                // exact for the constant divergence of many models, O(Δt²) otherwise, and one Jacobian
                // per interval instead of one per step.
                if (vectors == n)
                {
                    var traceNow = tangent.Divergence(t, augmented);
                    trace += 0.5 * (traceBefore + traceNow) * (t - lastQr);
                    traceBefore = traceNow;
                }

                lastQr = t;
            }

            if (halfReached)
            {
                halfTime = t - start;
                Array.Copy(sums, firstHalf, vectors);
            }
        }

        return Classify(start, end, halfTime, trace, crossings);
    }

    private PointResult Classify(double start, double end, double halfTime, double trace, long crossings)
    {
        var duration = end - start;
        var exponents = new double[vectors];
        var errors = new double[vectors];
        for (var i = 0; i < vectors; i++)
        {
            exponents[i] = sums[i] / duration;
            var early = firstHalf[i] / halfTime;
            var late = (sums[i] - firstHalf[i]) / (duration - halfTime);
            errors[i] = early == late ? 0 : Math.Abs(early - late);
        }

        plain.Derivative(end, state, slope);
        var atRest = !Forced && Norm(slope) <= settings.Tolerance * (1 + Norm(state));
        var period = atRest ? 0 : detector.FindPeriod();
        var verdict = FlowClassifier.Decide(new FlowMeasurements(n, Forced, atRest, period, crossings, exponents, errors), settings);
        var indicators = Indicators();
        if (indicators?.Disagreement(verdict.Regime) is { } disagreement)
        {
            verdict = verdict with { Reason = verdict.Reason is null ? disagreement : $"{verdict.Reason}; {disagreement}" };
        }

        var periodic = verdict.Regime == Regime.Periodic;
        var cycle = new List<double[]>();
        for (var i = detector.Count - period; periodic && i < detector.Count; i++)
        {
            cycle.Add(detector.State(i).ToArray());
        }

        return new PointResult(
            verdict.Regime,
            periodic ? period : 0,
            exponents,
            errors,
            vectors == n ? trace / duration : double.NaN,
            state.ToArray(),
            cycle,
            null,
            verdict.Reason,
            Samples(),
            periodic ? PeriodTime(period) : double.NaN,
            Indicators: indicators,
            Box: atRest ? StateBox.Point(state) : detector.Bounds(state));
    }

    /// <summary>The indicators of the recorded series, oldest value first; NaN when too few values were recorded.</summary>
    private Core.Indicators.IndicatorValues? Indicators()
    {
        if (series.Length == 0)
        {
            return null;
        }

        var count = (int)Math.Min(seriesCount, series.Length);
        if (count < IndicatorMinimum)
        {
            return new Core.Indicators.IndicatorValues(double.NaN, double.NaN, double.NaN);
        }

        var ordered = new double[count];
        for (var i = 0; i < count; i++)
        {
            ordered[i] = series[(int)((seriesCount - count + i) % series.Length)];
        }

        return Core.Indicators.IndicatorValues.Of(ordered);
    }

    /// <summary>The cycle's duration, averaged over as many whole cycles as the recorded returns hold.</summary>
    private double PeriodTime(int period)
    {
        if (Forced)
        {
            return period * forcingPeriod;
        }

        var count = detector.Count;
        var cycles = (count - 1) / period;
        var last = TimeAt(count - 1);
        var first = TimeAt(count - 1 - (cycles * period));
        return (last - first) / cycles;
    }

    private void Record(double[] point, double time)
    {
        detector.Push(point.AsSpan(0, n));
        if (series.Length > 0)
        {
            series[(int)(seriesCount++ % series.Length)] = point[seriesVariable];
        }

        times[(int)((detector.Pushed - 1) % times.Length)] = time;
    }

    private double TimeAt(int i) => times[(int)((detector.Pushed - detector.Count + i) % times.Length)];

    private bool Crosses(double before, double now) => section.Direction switch
    {
        SectionDirection.Up => before < 0 && now >= 0,
        SectionDirection.Down => before > 0 && now <= 0,
        _ => (before < 0 && now >= 0) || (before > 0 && now <= 0),
    };

    /// <summary>The crossing inside the last step, by the Illinois variant of regula falsi on the dense output.</summary>
    private double[] Locate(double gLow, double gHigh, double level, out double time)
    {
        var (low, high) = (0.0, 1.0);
        var side = 0;
        var theta = 1.0;
        for (var iteration = 0; iteration < LocateIterations && high - low > 1e-15; iteration++)
        {
            theta = Math.Clamp(((low * gHigh) - (high * gLow)) / (gHigh - gLow), low, high);
            tangentStepper.Interpolate(theta, probe, section.Variable + 1);
            var g = probe[section.Variable] - level;
            if (g == 0)
            {
                break;
            }

            if (Math.Sign(g) == Math.Sign(gLow))
            {
                (low, gLow) = (theta, g);
                gHigh = side == -1 ? gHigh / 2 : gHigh;
                side = -1;
            }
            else
            {
                (high, gHigh) = (theta, g);
                gLow = side == 1 ? gLow / 2 : gLow;
                side = 1;
            }
        }

        tangentStepper.Interpolate(theta, probe, n);
        var step = tangentStepper.EndTime - tangentStepper.StartTime;
        time = tangentStepper.StartTime + (theta * step);
        return probe;
    }

    /// <summary>The last section points (or stroboscopic samples); the final state when there were none.</summary>
    private double[] Samples() =>
        detector.Count == 0 && settings.Samples > 0 ? state.ToArray() : detector.Last(settings.Samples);


    private static double Norm(ReadOnlySpan<double> values)
    {
        var largest = 0.0;
        foreach (var value in values)
        {
            largest = Math.Max(largest, Math.Abs(value));
        }

        return largest;
    }

    /// <summary>
    /// A step that cannot be taken is a blow-up when the state is already far out (beyond √escape: a
    /// solution running to infinity in finite time, where the step collapses before the escape bound
    /// is reached); otherwise the point is unresolved (stiff or singular) with the stepper's reason.
    /// </summary>
    private PointResult StepFailed(Stepper stepper, long steps, double time)
    {
        if (!(Norm(stepper.Start.AsSpan(0, n)) <= Math.Sqrt(settings.Escape)))
        {
            Array.Copy(stepper.Start, state, n);
            var result = Divergent(steps, time);
            return result with { Reason = $"blew up near t = {Format(time)} (the step size collapsed with |x| beyond {Math.Sqrt(settings.Escape):g3})" };
        }

        return Unresolved(stepper.Failure!);
    }

    private PointResult Divergent(long step, double time)
    {
        var what = Array.TrueForAll(state, double.IsFinite)
            ? $"escaped beyond ±{settings.Escape:g3} at t = {Format(time)} (step {step})"
            : $"non-finite state at t = {Format(time)} (step {step})";
        return PointResult.Stopped(Regime.Divergent, vectors, state.ToArray(), step, what);
    }

    private PointResult Unresolved(string reason) =>
        PointResult.Stopped(Regime.Unresolved, vectors, state.ToArray(), null, reason);


    private static string Format(double value) => value.ToString("g6", CultureInfo.InvariantCulture);
}
