using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using Sweeps.Core.Models;

namespace Sweeps.Core.Analysis;

/// <summary>
/// Analyses points of an iterated map: transient, then a measured phase with the tangent map
/// (Benettin/QR method), then period detection and classification. An instance owns all its buffers
/// and is reused for every point of a chunk; it is not thread-safe — use one per worker.
/// </summary>
public sealed class MapAnalyzer : IPointAnalyzer
{
    private const int FlushEvery = 16;

    private readonly Model model;
    private readonly AnalysisSettings settings;
    private readonly int n;
    private readonly int vectors;
    private double[] x;
    private double[] y;
    private readonly double[] jacobian;
    private readonly double[] scratch;
    private readonly double[] cycleProduct;
    private readonly double[] cyclePoint;
    private double[] tangent;
    private double[] product;
    private readonly double[] norms;
    private readonly double[] products;
    private readonly double[] sums;
    private readonly double[] firstHalf;

    // A point's exponents, their errors and its samples as classified, reused from point to point (results copy them).
    private readonly double[] exponentValues;
    private readonly double[] errorValues;
    private readonly double[] sampleValues;
    private readonly PeriodDetector detector;

    // The running products of the tangent growths (and of |det J|) are split into mantissa and binary exponent every
    // FlushEvery steps (exact), the exponents summed here; logarithms are taken only at the half and at the end.
    private readonly long[] exponentSums;
    private long detExponent;

    // Several variables: Df, Df·Q and f in one generated call, the code the lanes of the block analyzer run.
    private readonly Kernels.MapStep<double>? tangentStep;

    // ln|det J| over the measurement, kept like the norms: a running product of |det J|, split with them, and logarithms
    // taken when it leaves the safe range (into logDetSum) and at the end.
    private double logDetSum;
    private double detProduct;

    // The starting tangent frame is the same for every point: built once, copied per point.
    private readonly double[] frame;
    private readonly double[] series;

    public MapAnalyzer(Model model, AnalysisSettings settings)
    {
        if (model.Kind != ModelKind.Map)
        {
            throw new ArgumentException("MapAnalyzer needs a map model", nameof(model));
        }

        this.model = model;
        this.settings = settings;
        n = model.Dimension;
        vectors = settings.Lyapunov switch
        {
            LyapunovMode.Spectrum => n,
            LyapunovMode.Largest => 1,
            _ => 0,
        };
        x = new double[n];
        y = new double[n];
        jacobian = new double[n * n];
        scratch = new double[n * n];
        cycleProduct = new double[n * n];
        cyclePoint = new double[n];
        tangent = new double[n * vectors];
        product = new double[n * vectors];
        norms = new double[Math.Max(vectors, 1)];
        products = new double[Math.Max(vectors, 1)];
        sums = new double[Math.Max(vectors, 1)];
        exponentSums = new long[Math.Max(vectors, 1)];
        tangentStep = n > 1 && vectors > 0 ? Kernels.MapStepCode.Scalar(model, vectors) : null;
        firstHalf = new double[Math.Max(vectors, 1)];
        detector = new PeriodDetector(n, settings.MaxPeriod, settings.Tolerance);
        exponentValues = new double[vectors];
        errorValues = new double[vectors];
        sampleValues = new double[Math.Min(settings.Samples, detector.Capacity) * n];
        frame = TangentFrame.Initial(n, vectors);
        series = settings.Indicators ? new double[(int)Math.Min(settings.Measure, IndicatorWindow)] : [];
    }

    /// <summary>Iterations of the first variable the indicators look at: the last ones measured.</summary>
    public const int IndicatorWindow = 2048;

    public Model Model => model;

    public AnalysisSettings Settings => settings;

    /// <summary>
    /// Results for part files only: no cycle states and no window box (<see cref="PointResult.Cycle"/> empty,
    /// <see cref="PointResult.Box"/> null), which a run stores nowhere unless it groups attractors. Everything else —
    /// regime, period, multiplier, exponents, samples — is the same, bit for bit.
    /// </summary>
    public bool Lean { get; init; }

    /// <summary>Analyses the orbit of <paramref name="initial"/> under parameters <paramref name="parameters"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public PointResult Analyze(ReadOnlySpan<double> initial, double[] parameters)
    {
        initial.CopyTo(x);
        detector.Reset();
        if (!PointResult.Bounded(x, settings.Escape))
        {
            return Divergent(0);
        }

        for (long step = 1; step <= settings.Transient; step++)
        {
            model.Evaluate(x, parameters, 0, y);
            (x, y) = (y, x);
            if (!PointResult.Bounded(x, settings.Escape))
            {
                return Divergent(step);
            }
        }

        ResetTangent();
        var measure = settings.Measure;
        var half = measure / 2;
        var recordFrom = measure - detector.Capacity;
        for (long step = 1; step <= measure; step++)
        {
            if (vectors > 0)
            {
                if (tangentStep is { } fused)
                {
                    // Several variables: Df, Df·Q and f(x) in one generated call (the block analyzer's code).
                    fused(x, parameters, tangent, product, jacobian, y);
                }
                else
                {
                    model.EvaluateJacobian(x, parameters, 0, jacobian);
                }

                if (!AdvanceTangent())
                {
                    return Unresolved($"non-finite tangent vector at iteration {settings.Transient + step}");
                }

                // For one variable ln|det J| is ln|f'|, the exponent itself: no second logarithm needed.
                if (vectors == n && n > 1)
                {
                    var running = detProduct * AbsDeterminant();
                    detProduct = running;
                    if (!(running is > SafeLow and < SafeHigh))
                    {
                        logDetSum += Math.Log(running);
                        detProduct = 1;
                    }
                }

                if ((step & (FlushEvery - 1)) == 0)
                {
                    FlushProducts();
                }
            }

            if (tangentStep is null)
            {
                model.Evaluate(x, parameters, 0, y);
            }

            (x, y) = (y, x);
            if (!PointResult.Bounded(x, settings.Escape))
            {
                return Divergent(settings.Transient + step);
            }

            if (step == half)
            {
                FlushProducts();
                for (var c = 0; c < vectors; c++)
                {
                    firstHalf[c] = sums[c] + LogOf(products[c], exponentSums[c]);
                }
            }

            if (step > recordFrom)
            {
                detector.Push(x);
            }

            if (series.Length > 0 && step > measure - series.Length)
            {
                series[(int)(step - (measure - series.Length) - 1)] = x[0];
            }
        }

        FlushProducts();
        for (var c = 0; c < vectors; c++)
        {
            sums[c] += LogOf(products[c], exponentSums[c]);
        }

        logDetSum += LogOf(detProduct, detExponent);
        return Classify(parameters);
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private PointResult Classify(double[] parameters)
    {
        var (period, verdict, logDetMean) = Judge(parameters);
        double[][] cycle = period == 0 || Lean ? [] : new double[period][];
        for (var i = 0; i < cycle.Length; i++)
        {
            cycle[i] = detector.State(detector.Count - period + i).ToArray();
        }

        var indicators = series.Length > 0 ? Core.Indicators.IndicatorValues.Of(series) : null;
        if (indicators?.Disagreement(verdict.Regime) is { } disagreement)
        {
            verdict = verdict with { Reason = verdict.Reason is null ? disagreement : $"{verdict.Reason}; {disagreement}" };
        }

        return new PointResult(
            verdict.Regime,
            verdict.Regime is Regime.FixedPoint or Regime.Periodic ? period : 0,
            exponentValues.ToArray(),
            errorValues.ToArray(),
            logDetMean,
            x.ToArray(),
            cycle,
            null,
            verdict.Reason,
            detector.Last(settings.Samples),
            Indicators: indicators,
            Box: Lean ? null : verdict.Regime is Regime.FixedPoint or Regime.Periodic ? StateBox.Of(cycle) : detector.Bounds(x));
    }

    /// <summary>
    /// Classifies as <see cref="Classify(double[])"/> does and hands the fields a part keeps to <paramref name="rows"/>
    /// as point <paramref name="lane"/>, from the analyzer's own buffers (with indicators: the whole result).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Classify(double[] parameters, IPointRows rows, int lane)
    {
        if (series.Length > 0)
        {
            rows.Add(lane, Classify(parameters));
            return;
        }

        var (period, verdict, _) = Judge(parameters);
        var samples = detector.Last(settings.Samples, sampleValues);
        rows.Add(lane, verdict.Regime, verdict.Regime is Regime.FixedPoint or Regime.Periodic ? period : 0, exponentValues, errorValues, x, verdict.Reason, samples);
    }

    /// <summary>The exponents and their errors (into the analyzer's buffers), the period and the verdict of the orbit just measured.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private (int Period, Verdict Verdict, double LogDetMean) Judge(double[] parameters)
    {
        Exponents();
        var logDetMean = vectors == n && n > 0 ? (n == 1 ? sums[0] : logDetSum) / settings.Measure : double.NaN;
        var period = detector.FindPeriod();
        var multiplier = period > 0 ? CycleMultiplier(period, parameters) : double.NaN;
        return (period, MapClassifier.Decide(period, multiplier, exponentValues, errorValues, settings), logDetMean);
    }

    /// <summary>The exponents and their convergence estimates into <see cref="exponentValues"/> and <see cref="errorValues"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Exponents()
    {
        var half = settings.Measure / 2;
        for (var i = 0; i < vectors; i++)
        {
            exponentValues[i] = sums[i] / settings.Measure;
            var early = firstHalf[i] / half;
            var late = (sums[i] - firstHalf[i]) / (settings.Measure - half);
            errorValues[i] = early == late ? 0.0 : Math.Abs(early - late);
        }
    }

    /// <summary>Spectral radius of the product of Jacobians around the cycle of the last <paramref name="period"/> recorded states (its Floquet multiplier).</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private double CycleMultiplier(int period, double[] parameters)
    {
        var (monodromy, next) = (cycleProduct, scratch);
        Array.Clear(monodromy);
        for (var i = 0; i < n; i++)
        {
            monodromy[(i * n) + i] = 1.0;
        }

        for (var i = detector.Count - period; i < detector.Count; i++)
        {
            detector.State(i).CopyTo(cyclePoint);
            model.EvaluateJacobian(cyclePoint, parameters, 0, jacobian);
            SmallMatrix.Multiply(jacobian, monodromy, next, n);
            (monodromy, next) = (next, monodromy);
        }

        return SmallMatrix.SpectralRadius(monodromy, n);
    }

    private void ResetTangent()
    {
        Array.Fill(products, 1.0);
        Array.Clear(exponentSums);
        logDetSum = 0;
        detProduct = 1;
        detExponent = 0;
        Array.Clear(sums);
        Array.Clear(firstHalf);
        frame.CopyTo(tangent, 0);
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private bool AdvanceTangent()
    {
        if (n == 1)
        {
            // One variable: the tangent is a number and its growth is |f'| itself — no normalisation needed.
            var growth = Math.Abs(jacobian[0]);
            if (!double.IsFinite(growth))
            {
                return false;
            }

            var product = products[0] * growth;
            products[0] = product;
            if (!(product is > SafeLow and < SafeHigh))
            {
                sums[0] += Math.Log(product);
                products[0] = 1;
            }

            return true;
        }

        // Df·Q is in product already (the generated step computed it).
        if (!Orthonormalizer.Orthonormalize(product, n, vectors, norms))
        {
            return false;
        }

        (tangent, product) = (product, tangent);
        for (var c = 0; c < vectors; c++)
        {
            // Norms are multiplied up and their logarithm taken every FlushEvery steps (or sooner when
            // the product leaves a safe range): one log per 16 steps instead of one per step.
            var running = products[c] * norms[c];
            products[c] = running;
            if (!(running is > SafeLow and < SafeHigh))
            {
                sums[c] += Math.Log(running);
                products[c] = 1;
            }
        }

        return true;
    }

    /// <summary>|det J| of the current Jacobian: the 2 × 2 formula, or elimination with pivoting on a copy.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private double AbsDeterminant()
    {
        if (n == 2)
        {
            return Math.Abs((jacobian[0] * jacobian[3]) - (jacobian[1] * jacobian[2]));
        }

        jacobian.CopyTo(scratch, 0);
        return SmallMatrix.AbsDeterminant(scratch, n);
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void FlushProducts()
    {
        for (var c = 0; c < vectors; c++)
        {
            (products[c], var exponent) = Split(products[c]);
            exponentSums[c] += exponent;
        }

        (detProduct, var detBits) = Split(detProduct);
        detExponent += detBits;
    }

    /// <summary>The running product of tangent growths is renormalised (its logarithm taken) when it leaves this range.</summary>
    internal const double SafeLow = 1e-280;

    internal const double SafeHigh = 1e280;

    /// <summary>
    /// Steps between logarithms of the running product; the block kernel (<see cref="Kernels.MapBlockAnalyzer"/>)
    /// takes them at the same steps, so that both give the same exponent bit for bit.
    /// </summary>
    internal const int FlushInterval = FlushEvery;

    /// <summary>
    /// A positive normal number as mantissa in [1, 2) and binary exponent — exact, so splitting the running product
    /// changes no later bit of it, and cheap (no logarithm). The block kernel does the same on whole vectors.
    /// </summary>
    internal static (double Mantissa, long Exponent) Split(double value)
    {
        var bits = BitConverter.DoubleToInt64Bits(value);
        return (BitConverter.Int64BitsToDouble((bits & MantissaBits) | OneBits), (bits >>> 52) - 1023);
    }

    internal const long MantissaBits = 0x000F_FFFF_FFFF_FFFF;

    internal const long OneBits = 0x3FF0_0000_0000_0000;

    /// <summary>
    /// ln(mantissa · 2^exponent), with ln 2 in two parts (the high one has trailing zero bits, so exponent · hi is
    /// exact): what the block kernel and this path both use, so they agree bit for bit.
    /// </summary>
    internal static double LogOf(double mantissa, long exponent) => (exponent * Ln2High) + (Math.Log(mantissa) + (exponent * Ln2Low));

    private const double Ln2High = 6.93147180369123816490e-01;

    private const double Ln2Low = 1.90821492927058770002e-10;

    /// <summary>
    /// Classifies a one-variable orbit computed elsewhere (by the block kernel): the sum of the logarithms of the
    /// tangent growth over the measurement and over its first half, the last recorded states (oldest first) and
    /// the final state. Gives exactly what <see cref="Analyze"/> gives for the same orbit.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    internal PointResult Finish(double sum, double firstHalfSum, double final, double[] parameters) =>
        Finish([final], [sum], [firstHalfSum], 0, parameters);

    /// <summary>As <see cref="Finish(double, double, double, double[])"/>, the outcome handed to <paramref name="rows"/> as point <paramref name="lane"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    internal void Finish(double sum, double firstHalfSum, double final, double[] parameters, IPointRows rows, int lane) =>
        Finish([final], [sum], [firstHalfSum], 0, parameters, rows, lane);

    /// <summary>
    /// Classifies an orbit computed elsewhere (by <see cref="Kernels.MapLaneAnalyzer"/>, or the block kernel for one variable):
    /// the final state, per tangent vector the sum of the logarithms of its growth over the measurement and over its
    /// first half, the sum of ln|det J| (0 unless the full spectrum was computed), and the last recorded states written
    /// into <see cref="Window"/> beforehand. Gives exactly what <see cref="Analyze"/> gives for the same orbit.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    internal PointResult Finish(ReadOnlySpan<double> final, ReadOnlySpan<double> growthSums, ReadOnlySpan<double> firstHalfSums, double logDet, double[] parameters)
    {
        Take(final, growthSums, firstHalfSums, logDet);
        return Classify(parameters);
    }

    /// <summary>As the method above, the outcome handed to <paramref name="rows"/> as point <paramref name="lane"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    internal void Finish(ReadOnlySpan<double> final, ReadOnlySpan<double> growthSums, ReadOnlySpan<double> firstHalfSums, double logDet, double[] parameters, IPointRows rows, int lane)
    {
        Take(final, growthSums, firstHalfSums, logDet);
        Classify(parameters, rows, lane);
    }

    private void Take(ReadOnlySpan<double> final, ReadOnlySpan<double> growthSums, ReadOnlySpan<double> firstHalfSums, double logDet)
    {
        final.CopyTo(x);
        growthSums.CopyTo(sums);
        firstHalfSums.CopyTo(firstHalf);
        logDetSum = logDet;
    }

    /// <summary>
    /// Where the block kernel writes the last <paramref name="states"/> recorded states of the orbit (oldest first)
    /// before it calls one of the <c>Finish</c> methods: the period test's own storage.
    /// </summary>
    internal Span<double> Window(int states) => detector.Fill(states);

    /// <summary>How many of the last measured states the period test keeps (2 · max period).</summary>
    internal int WindowLength => detector.Capacity;



    private PointResult Divergent(long step)
    {
        var what = Array.TrueForAll(x, double.IsFinite)
            ? $"escaped beyond ±{settings.Escape:g3} at iteration {step}"
            : $"non-finite state at iteration {step}";
        return PointResult.Stopped(Regime.Divergent, vectors, x.ToArray(), step, what);
    }

    private PointResult Unresolved(string reason) =>
        PointResult.Stopped(Regime.Unresolved, vectors, x.ToArray(), null, reason);

}
