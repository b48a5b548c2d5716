using System.Globalization;
using System.Runtime.CompilerServices;
using Sweeps.Core.Integrators;
using Sweeps.Core.Models;

namespace Sweeps.Core.Analysis;

/// <summary>
/// What one flow point accumulates while it is measured — exponent sums, section points or stroboscopic
/// samples with their times, the indicator series — and how that becomes a <see cref="PointResult"/>. The
/// scalar <see cref="FlowAnalyzer"/> keeps one; the lane-parallel <see cref="Kernels.FlowBlockAnalyzer"/> one
/// per lane, so both classify with the same code. Buffers are reused across points.
/// </summary>
internal sealed class FlowTrack
{
    private const int LocateIterations = 60;

    private readonly Model model;
    private readonly AnalysisSettings settings;
    private readonly SectionSettings section;
    private readonly int n;
    private readonly int vectors;
    private readonly double forcingPeriod;
    private readonly double[] slope;
    private readonly double[] norms;
    private readonly double[] sums;
    private readonly double[] firstHalf;
    private readonly double[] times;
    private readonly double[] probe;
    private readonly PeriodDetector detector;

    // Indicators: the last recorded values (section points or stroboscopic samples) of one variable, as a ring.
    private readonly double[] series;
    private readonly int seriesVariable;
    private long seriesCount;
    private double[] parameters = [];

    public FlowTrack(Model model, AnalysisSettings settings, SectionSettings section, int vectors, double forcingPeriod)
    {
        this.model = model;
        this.settings = settings;
        this.section = section;
        this.vectors = vectors;
        this.forcingPeriod = forcingPeriod;
        n = model.Dimension;
        State = new double[n];
        slope = new double[n];
        probe = new double[n];
        norms = new double[Math.Max(vectors, 1)];
        sums = new double[Math.Max(vectors, 1)];
        firstHalf = new double[Math.Max(vectors, 1)];
        times = new double[2 * settings.MaxPeriod];
        detector = new PeriodDetector(n, settings.MaxPeriod, settings.Tolerance);
        series = settings.Indicators ? new double[MapAnalyzer.IndicatorWindow] : [];

        // On a section its own variable is constant: watch the first other one.
        seriesVariable = model.UsesTime || n == 1 ? 0 : section.Variable == 0 ? 1 : 0;
    }

    public bool Forced => forcingPeriod > 0;

    /// <summary>The parameters of the current point.</summary>
    public double[] Parameters => parameters;

    /// <summary>The point's current state (n values): where stopped points and the final state are read from.</summary>
    public double[] State { get; }

    /// <summary>Starts a new point.</summary>
    public void Reset(double[] pointParameters)
    {
        parameters = pointParameters;
        detector.Reset();
        seriesCount = 0;
        Array.Clear(sums);
        Array.Clear(firstHalf);
    }

    /// <summary>Stores a section point or stroboscopic sample (its first n values) taken at <paramref name="time"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Record(double[] point, double time)
    {
        detector.Push(point.AsSpan(0, n));
        if (series.Length > 0)
        {
            series[(int)(seriesCount++ % series.Length)] = point[seriesVariable];
        }

        times[(int)((detector.Pushed - 1) % times.Length)] = time;
    }

    /// <summary>Re-orthonormalises the tangent vectors and adds the logarithms of their norms; false when one is not finite.</summary>
    public bool Orthonormalize(Span<double> tangents)
    {
        if (!Orthonormalizer.Orthonormalize(tangents, n, vectors, norms))
        {
            return false;
        }

        AddNorms(norms);
        return true;
    }

    /// <summary>Adds the logarithms of the norms |R_cc| of one re-orthonormalisation.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void AddNorms(ReadOnlySpan<double> values)
    {
        for (var c = 0; c < vectors; c++)
        {
            sums[c] += Math.Log(values[c]);
        }
    }

    /// <summary>The measurement's first half ends here (for the convergence estimate).</summary>
    public void MarkHalf() => Array.Copy(sums, firstHalf, vectors);

    public bool Crosses(double before, double now) => section.Direction switch
    {
        SectionDirection.Up => before < 0 && now >= 0,
        SectionDirection.Down => before > 0 && now <= 0,
        _ => (before < 0 && now >= 0) || (before > 0 && now <= 0),
    };

    /// <summary>
    /// The crossing inside the last step of <paramref name="dense"/>, by the Illinois variant of regula falsi on
    /// its dense output; returns the state there (first n values) and its time.
    /// </summary>
    public double[] Locate(IDenseOutput dense, double gLow, double gHigh, double level, out double time)
    {
        var (low, high) = (0.0, 1.0);
        var side = 0;
        var theta = 1.0;
        for (var iteration = 0; iteration < LocateIterations && high - low > 1e-15; iteration++)
        {
            theta = Math.Clamp(((low * gHigh) - (high * gLow)) / (gHigh - gLow), low, high);
            dense.Interpolate(theta, probe, section.Variable + 1);
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

        dense.Interpolate(theta, probe, n);
        var step = dense.EndTime - dense.StartTime;
        time = dense.StartTime + (theta * step);
        return probe;
    }

    /// <summary>The result of a measurement over [start, end] that ran to its end.</summary>
    public PointResult Classify(double start, double end, double halfTime, double trace, long crossings)
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

        model.Evaluate(State, parameters, end, slope);
        var atRest = !Forced && Norm(slope) <= settings.Tolerance * (1 + Norm(State));
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
            State.ToArray(),
            cycle,
            null,
            verdict.Reason,
            Samples(),
            periodic ? PeriodTime(period) : double.NaN,
            Indicators: indicators,
            Box: atRest ? StateBox.Point(State) : detector.Bounds(State));
    }

    /// <summary>
    /// A step that cannot be taken is a blow-up when the state at the start of the step is already far out
    /// (beyond √escape: a solution running to infinity in finite time, where the step collapses before the
    /// escape bound is reached); otherwise the point is unresolved (stiff or singular) with the stepper's reason.
    /// </summary>
    public PointResult StepFailed(ReadOnlySpan<double> stepStart, string failure, long steps, double time)
    {
        if (!(Norm(stepStart[..n]) <= Math.Sqrt(settings.Escape)))
        {
            stepStart[..n].CopyTo(State);
            var result = Divergent(steps, time);
            return result with { Reason = $"blew up near t = {Format(time)} (the step size collapsed with |x| beyond {Math.Sqrt(settings.Escape):g3})" };
        }

        return Unresolved(failure);
    }

    public PointResult Divergent(long step, double time)
    {
        var what = Array.TrueForAll(State, double.IsFinite)
            ? $"escaped beyond ±{settings.Escape:g3} at t = {Format(time)} (step {step})"
            : $"non-finite state at t = {Format(time)} (step {step})";
        return PointResult.Stopped(Regime.Divergent, vectors, State.ToArray(), step, what);
    }

    public PointResult Unresolved(string reason) =>
        PointResult.Stopped(Regime.Unresolved, vectors, State.ToArray(), null, reason);

    public PointResult BudgetUsed(long maxSteps, double time) =>
        Unresolved($"step budget of {maxSteps} used up at t = {Format(time)}");

    public PointResult TangentFailed(double time) => Unresolved($"non-finite tangent vector at t = {Format(time)}");

    /// <summary>The indicators of the recorded series, oldest value first; NaN when too few values were recorded.</summary>
    private Indicators.IndicatorValues? Indicators()
    {
        if (series.Length == 0)
        {
            return null;
        }

        var count = (int)Math.Min(seriesCount, series.Length);
        if (count < FlowAnalyzer.IndicatorMinimum)
        {
            return new Indicators.IndicatorValues(double.NaN, double.NaN, double.NaN);
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

    private double TimeAt(int i) => times[(int)((detector.Pushed - detector.Count + i) % times.Length)];

    /// <summary>The last section points (or stroboscopic samples); the final state when there were none.</summary>
    private double[] Samples() =>
        detector.Count == 0 && settings.Samples > 0 ? State.ToArray() : detector.Last(settings.Samples);

    private static double Norm(ReadOnlySpan<double> values)
    {
        var largest = 0.0;
        foreach (var value in values)
        {
            largest = Math.Max(largest, Math.Abs(value));
        }

        return largest;
    }

    public static string Format(double value) => value.ToString("g6", CultureInfo.InvariantCulture);
}
