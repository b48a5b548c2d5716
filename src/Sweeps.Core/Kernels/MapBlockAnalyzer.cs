using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;
using Sweeps.Core.Analysis;
using Sweeps.Core.Models;

namespace Sweeps.Core.Kernels;

/// <summary>
/// Analyses one-variable map points 32 at a time with <see cref="MapKernel"/>, giving exactly the results of
/// <see cref="MapAnalyzer"/>: the same orbit, the same logarithms of the running product at the same steps
/// (every <see cref="MapAnalyzer.FlushInterval"/> steps and at half the measurement), the same recorded window
/// and the same classification. Points the kernel flags (escape, non-finite values, a product outside the safe
/// range — superstable orbits among them) are analysed again by the scalar analyzer. One per thread.
/// </summary>
public sealed class MapBlockAnalyzer : IBlockAnalyzer
{
    private const int Lanes = MapKernel.Lanes;
    private const int Groups = MapKernel.Groups;
    private const int Width = MapKernel.Width;

    private readonly MapAnalyzer scalar;
    private readonly AnalysisSettings settings;
    private readonly MapKernel kernel;
    private readonly int parameterCount;
    private readonly bool measuresGrowth;
    private readonly Vector256<double>[] x = new Vector256<double>[Groups];
    private readonly Vector256<double>[] p;
    private readonly Vector256<double>[] product = new Vector256<double>[Groups];
    private readonly Vector256<double>[] flagged = new Vector256<double>[Groups];
    private readonly Vector256<long>[] binaryExponents = new Vector256<long>[Groups];
    private readonly Vector256<long>[] halfExponents = new Vector256<long>[Groups];
    private readonly Vector256<double>[] halfMantissas = new Vector256<double>[Groups];
    private readonly double[] window;
    private readonly double[] orbits;

    // States the block's window holds after Run: min(measure, window length).
    private int recorded;

    /// <param name="model">A one-variable map.</param>
    /// <param name="settings">The analysis settings.</param>
    /// <param name="lean">Results without cycle states and window box (<see cref="MapAnalyzer.Lean"/>).</param>
    /// <param name="width">
    /// Doubles per vector in the generated loops, 4 or 8 (default: 8 where the processor has 512-bit vectors, else 4).
    /// The results are the same bit for bit either way; only the speed differs.
    /// </param>
    public MapBlockAnalyzer(Model model, AnalysisSettings settings, bool lean = false, int? width = null)
    {
        if (!Supports(model, settings))
        {
            throw new ArgumentException("the block analyzer takes one-variable maps without indicators", nameof(model));
        }

        this.settings = settings;
        scalar = new MapAnalyzer(model, settings) { Lean = lean };
        kernel = MapKernel.For(model, settings.Escape, MapAnalyzer.SafeLow, MapAnalyzer.SafeHigh, width ?? MapKernel.PreferredWidth);
        parameterCount = model.Source.Parameters.Count;
        measuresGrowth = settings.Lyapunov != LyapunovMode.None;
        p = new Vector256<double>[Math.Max(1, parameterCount * Groups)];
        window = new double[scalar.WindowLength * Lanes];
        orbits = new double[scalar.WindowLength * Lanes];
    }

    /// <summary>Points per block.</summary>
    public const int BlockSize = Lanes;

    int IBlockAnalyzer.BlockSize => BlockSize;

    IPointAnalyzer IBlockAnalyzer.Scalar => scalar;

    /// <summary>Whether the block analyzer applies: a one-variable map, no indicators, on a machine with 256-bit vectors.</summary>
    public static bool Supports(Model model, AnalysisSettings settings) =>
        model.Kind == ModelKind.Map && model.Dimension == 1 && !settings.Indicators && Vector256.IsHardwareAccelerated;

    /// <summary>The scalar analyzer behind it (same model and settings), for single points.</summary>
    public MapAnalyzer Scalar => scalar;

    /// <summary>
    /// Analyses <paramref name="count"/> ≤ 32 points: <paramref name="initial"/>[i] and <paramref name="parameters"/>[i]
    /// describe point i; its result goes to <paramref name="results"/>[i].
    /// </summary>
    public void Analyze(double[][] initial, double[][] parameters, int count, PointResult[] results)
    {
        Run(initial, parameters, count);
        Finish(initial, parameters, count, new BlockOutcomes(results, null));
    }

    /// <summary>
    /// As <see cref="Analyze(double[][], double[][], int, PointResult[])"/>, each outcome handed to <paramref name="rows"/>
    /// in order, as soon as it is classified — as fields where the block classifies a point itself, as a result where the
    /// scalar analyzer does it again. If this throws, the points before the one it failed on have been handed over.
    /// </summary>
    public void Analyze(double[][] initial, double[][] parameters, int count, IPointRows rows)
    {
        Run(initial, parameters, count);
        Finish(initial, parameters, count, new BlockOutcomes(null, rows));
    }

    /// <summary>The orbits of the block's points: the kernel's transient and measurement, the recorded window.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Run(double[][] initial, double[][] parameters, int count)
    {
        Load(initial, parameters, count);
        var measure = settings.Measure;
        var half = measure / 2;
        var capacity = scalar.WindowLength;
        var recordFrom = measure - capacity;
        if (settings.Transient > 0)
        {
            Advance(kernel.Transient, settings.Transient);
        }

        Array.Fill(product, Vector256<double>.One);
        Array.Clear(binaryExponents);
        var step = 0L;
        while (step < measure)
        {
            // The next step at which something happens: a logarithm, the half, or recording the window.
            var next = Math.Min(measure, ((step / MapAnalyzer.FlushInterval) + 1) * MapAnalyzer.FlushInterval);
            if (step < half)
            {
                next = Math.Min(next, half);
            }

            if (step < recordFrom)
            {
                next = Math.Min(next, recordFrom);
                Advance(measuresGrowth ? kernel.Measure : kernel.Transient, next - step);
            }
            else
            {
                // Recording: the kernel stores each state, slot-major, from this step's slot on.
                var recording = measuresGrowth ? kernel.RecordMeasure : kernel.RecordPlain;
                recording(x, p, product, flagged, (int)(next - step), window, (int)(step - Math.Max(recordFrom, 0)));
            }

            step = next;
            if (measuresGrowth && step % MapAnalyzer.FlushInterval == 0)
            {
                Flush();
            }

            if (step == half)
            {
                if (measuresGrowth)
                {
                    Flush();
                }

                Array.Copy(binaryExponents, halfExponents, Groups);
                Array.Copy(product, halfMantissas, Groups);
            }

        }

        if (measuresGrowth)
        {
            Flush();
        }

        recorded = (int)Math.Min(measure, capacity);
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Load(double[][] initial, double[][] parameters, int count)
    {
        Array.Clear(flagged);
        for (var g = 0; g < Groups; g++)
        {
            x[g] = Vector256.Create(Value(initial, count, g, 0, 0), Value(initial, count, g, 1, 0), Value(initial, count, g, 2, 0), Value(initial, count, g, 3, 0));
            for (var k = 0; k < parameterCount; k++)
            {
                p[(k * Groups) + g] = Vector256.Create(Value(parameters, count, g, 0, k), Value(parameters, count, g, 1, k), Value(parameters, count, g, 2, k), Value(parameters, count, g, 3, k));
            }

            var bounded = Vector256.LessThanOrEqual(Vector256.Abs(x[g]), Vector256.Create(settings.Escape));
            flagged[g] = Vector256.OnesComplement(bounded);
        }
    }

    /// <summary>Lanes beyond the block's points repeat its first point (their results are not used).</summary>
    private static double Value(double[][] values, int count, int group, int element, int index)
    {
        var point = (group * Width) + element;
        return values[point < count ? point : 0][index];
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Advance(BlockSteps steps, long count)
    {
        while (count > 0)
        {
            var chunk = (int)Math.Min(count, int.MaxValue);
            steps(x, p, product, flagged, chunk);
            count -= chunk;
        }
    }

    /// <summary>Splits each running product into mantissa and binary exponent (<see cref="LaneMath.Split"/>).</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Flush()
    {
        for (var g = 0; g < Groups; g++)
        {
            product[g] = LaneMath.Split(product[g], ref binaryExponents[g]);
        }
    }

    /// <summary>Each point's outcome to <paramref name="outcomes"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Finish(double[][] initial, double[][] parameters, int count, BlockOutcomes outcomes)
    {
        Transpose(recorded);
        for (var i = 0; i < count; i++)
        {
            var (g, e) = (i / Width, i % Width);
            if (flagged[g].GetElement(e) != 0)
            {
                outcomes.Add(i, Careful(initial[i], parameters[i]));
                continue;
            }

            orbits.AsSpan(i * scalar.WindowLength, recorded).CopyTo(scalar.Window(recorded));

            var sum = measuresGrowth ? MapAnalyzer.LogOf(product[g].GetElement(e), binaryExponents[g].GetElement(e)) : 0;
            var firstHalf = measuresGrowth ? MapAnalyzer.LogOf(halfMantissas[g].GetElement(e), halfExponents[g].GetElement(e)) : 0;
            if (outcomes.WholeResults)
            {
                outcomes.Add(i, scalar.Finish(sum, firstHalf, x[g].GetElement(e), parameters[i]));
            }
            else
            {
                scalar.Finish(sum, firstHalf, x[g].GetElement(e), parameters[i], outcomes.Rows, i);
            }
        }
    }

    /// <summary>
    /// The recorded window (slot-major: the 32 lanes of a slot side by side) lane-major into <see cref="orbits"/>, each
    /// lane's states contiguous: four slots of four lanes at a time as a 4 × 4 transpose in registers, the rest one
    /// by one. Moves values only.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Transpose(int recorded)
    {
        var capacity = scalar.WindowLength;
        var slot = 0;
        if (Avx.IsSupported)
        {
            ref var from = ref MemoryMarshal.GetArrayDataReference(window);
            ref var to = ref MemoryMarshal.GetArrayDataReference(orbits);
            for (; slot + 3 < recorded; slot += 4)
            {
                for (var g = 0; g < Groups; g++)
                {
                    var at = (nuint)((slot * Lanes) + (g * Width));
                    var a0 = Vector256.LoadUnsafe(ref from, at);
                    var a1 = Vector256.LoadUnsafe(ref from, at + Lanes);
                    var a2 = Vector256.LoadUnsafe(ref from, at + (2 * Lanes));
                    var a3 = Vector256.LoadUnsafe(ref from, at + (3 * Lanes));
                    var (low01, high01) = (Avx.UnpackLow(a0, a1), Avx.UnpackHigh(a0, a1));
                    var (low23, high23) = (Avx.UnpackLow(a2, a3), Avx.UnpackHigh(a2, a3));
                    var lane = (nuint)((g * Width * capacity) + slot);
                    Avx.Permute2x128(low01, low23, 0x20).StoreUnsafe(ref to, lane);
                    Avx.Permute2x128(high01, high23, 0x20).StoreUnsafe(ref to, lane + (nuint)capacity);
                    Avx.Permute2x128(low01, low23, 0x31).StoreUnsafe(ref to, lane + (nuint)(2 * capacity));
                    Avx.Permute2x128(high01, high23, 0x31).StoreUnsafe(ref to, lane + (nuint)(3 * capacity));
                }
            }
        }

        for (; slot < recorded; slot++)
        {
            for (var i = 0; i < Lanes; i++)
            {
                orbits[(i * capacity) + slot] = window[(slot * Lanes) + i];
            }
        }
    }

    private PointResult Careful(double[] initial, double[] parameters)
    {
        Rechecked++;
        return scalar.Analyze(initial, parameters);
    }

    /// <summary>Points the kernel flagged and the scalar analyzer computed (a count since construction).</summary>
    public long Rechecked { get; private set; }
}
