using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using Sweeps.Core.Analysis;
using Sweeps.Core.Models;

namespace Sweeps.Core.Kernels;

/// <summary>
/// Analyses points of a map with several variables four at a time, giving exactly the results of
/// <see cref="MapAnalyzer"/>: one generated step (<see cref="MapStepCode"/>, the scalar analyzer's own code over
/// <see cref="Vector256{T}"/> lanes) advances the four states and their tangent vectors, the QR step runs lane-wise
/// (<see cref="LaneOrthonormalizer"/>), the running products of the norms and of |det J| are kept and split like the
/// scalar ones, and the last states are recorded for the period test. One point's chain of dependent operations per
/// step (product, norm, division, projection) is what limits the scalar analyzer; four independent chains in one
/// vector hide it. A lane whose point escapes, turns non-finite, meets a zero or non-finite norm, or whose running
/// product leaves the safe range is analysed again by the scalar analyzer, which handles those cases; so is a block
/// whose every point did. The classification is the scalar code's. One per thread.
/// </summary>
public sealed class MapLaneAnalyzer : IBlockAnalyzer
{
    private const int Width = 4;

    private readonly AnalysisSettings settings;
    private readonly MapAnalyzer scalar;
    private readonly int n;
    private readonly int vectors;
    private readonly bool determinant;
    private readonly MapStep<Vector256<double>> plainStep;
    private readonly MapStep<Vector256<double>> tangentStep;
    private readonly double[] frame;
    private readonly Vector256<double>[] p;
    private Vector256<double>[] x;
    private Vector256<double>[] y;
    private Vector256<double>[] q;
    private Vector256<double>[] jq;
    private readonly Vector256<double>[] jacobian;
    private readonly Vector256<double>[] norms;
    private readonly Vector256<double>[] products;
    private readonly Vector256<long>[] exponents;
    private readonly Vector256<double>[] halfMantissas;
    private readonly Vector256<long>[] halfExponents;
    private Vector256<double> detProduct;
    private Vector256<long> detExponent;
    private readonly double[] window;
    private readonly double[] final;
    private readonly double[] laneSums;
    private readonly double[] laneHalves;
    private double laneLogDet;
    private readonly double[] laneJacobian;
    private int flagged;

    /// <param name="model">A map of two or more variables.</param>
    /// <param name="settings">The analysis settings.</param>
    /// <param name="lean">Results without cycle states and window box (<see cref="MapAnalyzer.Lean"/>).</param>
    public MapLaneAnalyzer(Model model, AnalysisSettings settings, bool lean = false)
    {
        if (!Supports(model, settings))
        {
            throw new ArgumentException("the lane analyzer takes maps of several variables without indicators", nameof(model));
        }

        this.settings = settings;
        scalar = new MapAnalyzer(model, settings) { Lean = lean };
        n = model.Dimension;
        vectors = settings.Lyapunov switch
        {
            LyapunovMode.Spectrum => n,
            LyapunovMode.Largest => 1,
            _ => 0,
        };
        determinant = vectors == n;
        plainStep = MapStepCode.Lanes(model, 0);
        tangentStep = MapStepCode.Lanes(model, vectors);
        frame = TangentFrame.Initial(n, vectors);
        p = new Vector256<double>[Math.Max(1, model.Parameters.Count)];
        x = new Vector256<double>[n];
        y = new Vector256<double>[n];
        q = new Vector256<double>[Math.Max(1, n * vectors)];
        jq = new Vector256<double>[Math.Max(1, n * vectors)];
        jacobian = new Vector256<double>[n * n];
        norms = new Vector256<double>[Math.Max(1, vectors)];
        products = new Vector256<double>[Math.Max(1, vectors)];
        exponents = new Vector256<long>[Math.Max(1, vectors)];
        halfMantissas = new Vector256<double>[Math.Max(1, vectors)];
        halfExponents = new Vector256<long>[Math.Max(1, vectors)];
        window = new double[scalar.WindowLength * n * Width];
        final = new double[n];
        laneSums = new double[vectors];
        laneHalves = new double[vectors];
        laneJacobian = new double[n * n];
    }

    /// <summary>Points per block.</summary>
    public const int BlockSize = Width;

    int IBlockAnalyzer.BlockSize => BlockSize;

    IPointAnalyzer IBlockAnalyzer.Scalar => scalar;

    /// <summary>Whether the lane analyzer applies: a map of two or more variables, no indicators, on a machine with 256-bit vectors.</summary>
    public static bool Supports(Model model, AnalysisSettings settings) =>
        model.Kind == ModelKind.Map && model.Dimension >= 2 && !settings.Indicators && Vector256.IsHardwareAccelerated;

    /// <summary>Points the lanes flagged and the scalar analyzer computed (a count since construction).</summary>
    public long Rechecked { get; private set; }

    public void Analyze(double[][] initial, double[][] parameters, int count, PointResult[] results) =>
        Analyze(initial, parameters, count, new BlockOutcomes(results, null));

    /// <summary>
    /// As <see cref="Analyze(double[][], double[][], int, PointResult[])"/>, each outcome handed to <paramref name="rows"/>
    /// in order — as fields where the lanes classify a point themselves, as a result where the scalar analyzer does it
    /// again. If this throws, the points before the one it failed on have been handed over.
    /// </summary>
    public void Analyze(double[][] initial, double[][] parameters, int count, IPointRows rows) =>
        Analyze(initial, parameters, count, new BlockOutcomes(null, rows));

    /// <summary>Each point's outcome to <paramref name="outcomes"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Analyze(double[][] initial, double[][] parameters, int count, BlockOutcomes outcomes)
    {
        var live = (1 << count) - 1;
        Load(initial, parameters, count);
        var recorded = 0;
        if (Transient(live) && Measure(live))
        {
            recorded = (int)Math.Min(settings.Measure, scalar.WindowLength);
        }
        else
        {
            flagged = live;
        }

        for (var j = 0; j < count; j++)
        {
            if ((flagged & (1 << j)) != 0)
            {
                outcomes.Add(j, Careful(initial[j], parameters[j]));
                continue;
            }

            Prepare(j, recorded);
            if (outcomes.WholeResults)
            {
                outcomes.Add(j, scalar.Finish(final, laneSums, laneHalves, laneLogDet, parameters[j]));
            }
            else
            {
                scalar.Finish(final, laneSums, laneHalves, laneLogDet, parameters[j], outcomes.Rows, j);
            }
        }
    }

    /// <summary>Lanes beyond the block's points repeat its first point (their results are not used).</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Load(double[][] initial, double[][] parameters, int count)
    {
        for (var i = 0; i < n; i++)
        {
            x[i] = Vector256.Create(Value(initial, count, 0, i), Value(initial, count, 1, i), Value(initial, count, 2, i), Value(initial, count, 3, i));
        }

        for (var k = 0; k < p.Length && k < parameters[0].Length; k++)
        {
            p[k] = Vector256.Create(Value(parameters, count, 0, k), Value(parameters, count, 1, k), Value(parameters, count, 2, k), Value(parameters, count, 3, k));
        }

        flagged = Escaped(x);
    }

    private static double Value(double[][] values, int count, int lane, int index) => values[lane < count ? lane : 0][index];

    /// <summary>The transient; false when every point was flagged (the block ends early).</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private bool Transient(int live)
    {
        for (long step = 1; step <= settings.Transient; step++)
        {
            plainStep(x, p, q, jq, jacobian, y);
            (x, y) = (y, x);
            flagged |= Escaped(x);
            if ((step & (MapAnalyzer.FlushInterval - 1)) == 0 && (flagged & live) == live)
            {
                return false;
            }
        }

        return true;
    }

    /// <summary>The measured phase, step for step as <see cref="MapAnalyzer.Analyze"/>; false when every point was flagged.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private bool Measure(int live)
    {
        var measure = settings.Measure;
        var half = measure / 2;
        var recordFrom = measure - scalar.WindowLength;
        for (var i = 0; i < frame.Length; i++)
        {
            q[i] = Vector256.Create(frame[i]);
        }

        Array.Fill(products, Vector256<double>.One);
        Array.Clear(exponents);
        detProduct = Vector256<double>.One;
        detExponent = Vector256<long>.Zero;
        for (long step = 1; step <= measure; step++)
        {
            if (vectors > 0)
            {
                tangentStep(x, p, q, jq, jacobian, y);
                flagged |= LaneOrthonormalizer.Orthonormalize(jq, 0, n, vectors, norms);
                (q, jq) = (jq, q);
                for (var c = 0; c < vectors; c++)
                {
                    var running = products[c] * norms[c];
                    products[c] = running;
                    flagged |= OutsideSafeRange(running);
                }

                if (determinant)
                {
                    var running = detProduct * AbsDeterminant();
                    detProduct = running;
                    flagged |= OutsideSafeRange(running);
                }

                if ((step & (MapAnalyzer.FlushInterval - 1)) == 0)
                {
                    Split();
                    if ((flagged & live) == live)
                    {
                        return false;
                    }
                }
            }
            else
            {
                plainStep(x, p, q, jq, jacobian, y);
            }

            (x, y) = (y, x);
            flagged |= Escaped(x);
            if (step == half)
            {
                Split();
                Array.Copy(products, halfMantissas, products.Length);
                Array.Copy(exponents, halfExponents, exponents.Length);
            }

            if (step > recordFrom)
            {
                var slot = (int)(step - Math.Max(recordFrom, 0) - 1) * n;
                for (var i = 0; i < n; i++)
                {
                    x[i].CopyTo(window, (slot + i) * Width);
                }
            }
        }

        Split();
        return (flagged & live) != live;
    }

    /// <summary>|det J| lane by lane: the 2 × 2 formula as the scalar code writes it, or its elimination on each lane.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private Vector256<double> AbsDeterminant()
    {
        if (n == 2)
        {
            return Vector256.Abs((jacobian[0] * jacobian[3]) - (jacobian[1] * jacobian[2]));
        }

        Span<double> lanes = stackalloc double[Width];
        for (var j = 0; j < Width; j++)
        {
            for (var e = 0; e < laneJacobian.Length; e++)
            {
                laneJacobian[e] = jacobian[e].GetElement(j);
            }

            lanes[j] = SmallMatrix.AbsDeterminant(laneJacobian, n);
        }

        return Vector256.Create(lanes[0], lanes[1], lanes[2], lanes[3]);
    }

    /// <summary>Splits the running products into mantissa and binary exponent, as <see cref="MapAnalyzer.Split"/> does (exact).</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Split()
    {
        for (var c = 0; c < vectors; c++)
        {
            products[c] = LaneMath.Split(products[c], ref exponents[c]);
        }

        detProduct = LaneMath.Split(detProduct, ref detExponent);
    }

    private int Escaped(Vector256<double>[] state) => LaneMath.Escaped(state, n, settings.Escape);

    /// <summary>Lanes whose running product left (<see cref="MapAnalyzer.SafeLow"/>, <see cref="MapAnalyzer.SafeHigh"/>), where the scalar code takes a logarithm early.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static int OutsideSafeRange(Vector256<double> running)
    {
        var inside = Vector256.GreaterThan(running, Vector256.Create(MapAnalyzer.SafeLow)) & Vector256.LessThan(running, Vector256.Create(MapAnalyzer.SafeHigh));
        return (int)~inside.ExtractMostSignificantBits() & 0xF;
    }

    /// <summary>Lane <paramref name="j"/>'s final state, logarithms and window, ready for the scalar classification.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Prepare(int j, int recorded)
    {
        for (var i = 0; i < n; i++)
        {
            final[i] = x[i].GetElement(j);
        }

        for (var c = 0; c < vectors; c++)
        {
            laneSums[c] = MapAnalyzer.LogOf(products[c].GetElement(j), exponents[c].GetElement(j));
            laneHalves[c] = MapAnalyzer.LogOf(halfMantissas[c].GetElement(j), halfExponents[c].GetElement(j));
        }

        var orbit = scalar.Window(recorded);
        for (var k = 0; k < orbit.Length; k++)
        {
            orbit[k] = window[(k * Width) + j];
        }

        laneLogDet = MapAnalyzer.LogOf(detProduct.GetElement(j), detExponent.GetElement(j));
    }

    private PointResult Careful(double[] initial, double[] pointParameters)
    {
        Rechecked++;
        return scalar.Analyze(initial, pointParameters);
    }
}
