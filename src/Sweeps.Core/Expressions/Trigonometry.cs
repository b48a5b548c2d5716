using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;

namespace Sweeps.Core.Expressions;

/// <summary>
/// Sine and cosine of the model language, for one value and for four lanes at once with the same bits in every lane.
/// Written here because speed demands it: a forced flow spends a third of its time in the forcing term's cosine, and
/// the block analyzers could only call the platform's scalar routine lane by lane. The runtime's own vector sine and
/// cosine cannot stand in, because a lane's result there depends on the other lanes' values (measured: a large or
/// small neighbour switches the whole vector to another path), which would break the block analyzers' promise of
/// the scalar results bit for bit.
/// <para>
/// The method is the classic one of fdlibm (Sun Microsystems, 1993): the argument is reduced by π/2 in three 33-bit
/// pieces with their tails (Cody–Waite; exact products for quotients below 2^20), giving the remainder as a
/// double-double in [−π/4, π/4], and the sine and cosine kernels are fdlibm's minimax polynomials of degree 13 and 14
/// with their double-double corrections. The reduction is always carried to its third piece (fdlibm stops early when
/// no cancellation occurred; going on only adds bits), and every branch of the kernels is a lane-wise choice. The
/// scalar and the vector code perform the same IEEE operations in the same order (no fused multiply-add), so they agree
/// bit for bit (tested); against the platform's correctly rounded routine the results differ by at most one unit in the
/// last place (tested on random arguments over the whole reduced range). Arguments beyond 2^19·π/2 in magnitude, and
/// non-finite ones, go to <see cref="Math.Sin"/>/<see cref="Math.Cos"/> — lane by lane, from that lane's value alone.
/// </para>
/// </summary>
public static class Trigonometry
{
    /// <summary>Largest magnitude reduced here: 2^19·π/2 (quotients stay below 2^20, so the products are exact).</summary>
    public const double Limit = 823549.6;

    // The constants are fdlibm's (e_rem_pio2.c, k_sin.c, k_cos.c), written from memory; TrigonometryTests checks them:
    // a wrong digit that mattered would show as errors of many units in the last place against the platform's routines.

    // 2/π and π/2 in three 33-bit pieces, each with the rest of π/2 after it.
    private const double InversePiOverTwo = 6.36619772367581382433e-01;
    private const double PiOverTwo1 = 1.57079632673412561417e+00;
    private const double PiOverTwo2 = 6.07710050630396597660e-11;
    private const double PiOverTwo2Tail = 2.02226624879595063154e-21;
    private const double PiOverTwo3 = 2.02226624871116645580e-21;
    private const double PiOverTwo3Tail = 8.47842766036889956997e-32;

    // Sine kernel on [−π/4, π/4] (fdlibm's k_sin).
    private const double S1 = -1.66666666666666324348e-01;
    private const double S2 = 8.33333333332248946124e-03;
    private const double S3 = -1.98412698298579493134e-04;
    private const double S4 = 2.75573137070700676789e-06;
    private const double S5 = -2.50507602534068634195e-08;
    private const double S6 = 1.58969099521155010221e-10;

    // Cosine kernel on [−π/4, π/4] (fdlibm's k_cos).
    private const double C1 = 4.16666666666666019037e-02;
    private const double C2 = -1.38888888888741095749e-03;
    private const double C3 = 2.48015872894767294178e-05;
    private const double C4 = -2.75573143513906633035e-07;
    private const double C5 = 2.08757232129817482790e-09;
    private const double C6 = -1.13596475577881948265e-11;

    // The cosine kernel's three regimes: |x| < 0.3 (high word 0x3FD33333), above 0.78125 (high word 0x3FE90000).
    private static readonly double SmallCosine = BitConverter.Int64BitsToDouble(0x3FD3333300000000);
    private static readonly double LargeCosine = BitConverter.Int64BitsToDouble(0x3FE9000100000000);
    private const long QuarterExponent = 0x0020000000000000;
    private const long HighWord = unchecked((long)0xFFFFFFFF00000000);

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static double Sin(double x)
    {
        var a = Math.Abs(x);
        if (!(a <= Limit))
        {
            return Math.Sin(x);
        }

        var value = Shifted(a, 0);
        return double.IsNegative(x) ? -value : value;
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static double Cos(double x)
    {
        var a = Math.Abs(x);
        return a <= Limit ? Shifted(a, 1) : Math.Cos(x);
    }

    /// <summary><see cref="Sin(double)"/> of each lane.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static Vector256<double> Sin(Vector256<double> x)
    {
        var a = Vector256.Abs(x);
        var sign = (x.AsInt64() & Vector256.Create(long.MinValue)).AsDouble();
        return Exceptional(x, a, Shifted(a, Vector256<long>.Zero) ^ sign, Math.Sin);
    }

    /// <summary><see cref="Cos(double)"/> of each lane.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static Vector256<double> Cos(Vector256<double> x)
    {
        var a = Vector256.Abs(x);
        return Exceptional(x, a, Shifted(a, Vector256<long>.One), Math.Cos);
    }

    /// <summary>
    /// sin(a + offset·π/2) for 0 ≤ a ≤ <see cref="Limit"/> — the cosine is the sine a quadrant on: the quadrant's low bit
    /// picks the kernel, its second bit the sign.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double Shifted(double a, int offset)
    {
        var quadrant = Reduce(a, out var head, out var tail) + offset;
        var value = (quadrant & 1) == 0 ? SineKernel(head, tail) : CosineKernel(head, tail);
        return (quadrant & 2) == 0 ? value : -value;
    }

    /// <summary><see cref="Shifted(double, int)"/> of each lane (lanes beyond the limit give any value).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static Vector256<double> Shifted(Vector256<double> a, Vector256<long> offset)
    {
        var quadrant = Reduce(a, out var head, out var tail) + offset;
        var even = Vector256.Equals(quadrant & Vector256<long>.One, Vector256<long>.Zero).AsDouble();
        var value = Vector256.ConditionalSelect(even, SineKernel(head, tail), CosineKernel(head, tail));
        return value ^ (Vector256.ShiftLeft(quadrant, 62) & Vector256.Create(long.MinValue)).AsDouble();
    }

    /// <summary>Lanes beyond <see cref="Limit"/> or not finite, from the platform's routine; the others as computed.</summary>
    private static Vector256<double> Exceptional(Vector256<double> x, Vector256<double> a, Vector256<double> value, Func<double, double> platform)
    {
        var outside = ~Vector256.LessThanOrEqual(a, Vector256.Create(Limit));
        if (outside == Vector256<double>.Zero)
        {
            return value;
        }

        var lanes = outside.ExtractMostSignificantBits();
        for (var j = 0; j < Vector256<double>.Count; j++)
        {
            if ((lanes & (1u << j)) != 0)
            {
                value = value.WithElement(j, platform(x.GetElement(j)));
            }
        }

        return value;
    }

    /// <summary>a = quadrant·π/2 + (head + tail), |head + tail| ≤ π/4 (about); returns the quadrant.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static int Reduce(double a, out double head, out double tail)
    {
        var quotient = Math.Floor((a * InversePiOverTwo) + 0.5);
        var r = a - (quotient * PiOverTwo1);
        var t = r;
        var w = quotient * PiOverTwo2;
        r = t - w;
        w = (quotient * PiOverTwo2Tail) - ((t - r) - w);
        t = r;
        w = quotient * PiOverTwo3;
        r = t - w;
        w = (quotient * PiOverTwo3Tail) - ((t - r) - w);
        head = r - w;
        tail = (r - head) - w;
        return (int)(long)quotient;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static Vector256<long> Reduce(Vector256<double> a, out Vector256<double> head, out Vector256<double> tail)
    {
        var quotient = Vector256.Floor((a * Vector256.Create(InversePiOverTwo)) + Vector256.Create(0.5));
        var r = a - (quotient * Vector256.Create(PiOverTwo1));
        var t = r;
        var w = quotient * Vector256.Create(PiOverTwo2);
        r = t - w;
        w = (quotient * Vector256.Create(PiOverTwo2Tail)) - ((t - r) - w);
        t = r;
        w = quotient * Vector256.Create(PiOverTwo3);
        r = t - w;
        w = (quotient * Vector256.Create(PiOverTwo3Tail)) - ((t - r) - w);
        head = r - w;
        tail = (r - head) - w;

        // The quotient's low bits, read from the mantissa of quotient + 1.5·2^52 (exact below 2^51); lanes outside the
        // limit give any quadrant here and are replaced afterwards.
        return (quotient + Vector256.Create(6755399441055744.0)).AsInt64();
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double SineKernel(double x, double y)
    {
        var z = x * x;
        var v = z * x;
        var r = S2 + (z * (S3 + (z * (S4 + (z * (S5 + (z * S6)))))));
        return x - (((z * ((0.5 * y) - (v * r))) - y) - (v * S1));
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static Vector256<double> SineKernel(Vector256<double> x, Vector256<double> y)
    {
        var z = x * x;
        var v = z * x;
        var r = Vector256.Create(S2) + (z * (Vector256.Create(S3) + (z * (Vector256.Create(S4) + (z * (Vector256.Create(S5) + (z * Vector256.Create(S6))))))));
        return x - (((z * ((Vector256.Create(0.5) * y) - (v * r))) - y) - (v * Vector256.Create(S1)));
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double CosineKernel(double x, double y)
    {
        var z = x * x;
        var r = z * (C1 + (z * (C2 + (z * (C3 + (z * (C4 + (z * (C5 + (z * C6))))))))));
        var a = Math.Abs(x);
        if (a < SmallCosine)
        {
            return 1.0 - ((0.5 * z) - ((z * r) - (x * y)));
        }

        var quarter = a >= LargeCosine ? 0.28125 : BitConverter.Int64BitsToDouble((BitConverter.DoubleToInt64Bits(a) - QuarterExponent) & HighWord);
        var hz = (0.5 * z) - quarter;
        return (1.0 - quarter) - (hz - ((z * r) - (x * y)));
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static Vector256<double> CosineKernel(Vector256<double> x, Vector256<double> y)
    {
        var z = x * x;
        var r = z * (Vector256.Create(C1) + (z * (Vector256.Create(C2) + (z * (Vector256.Create(C3) + (z * (Vector256.Create(C4) + (z * (Vector256.Create(C5) + (z * Vector256.Create(C6)))))))))));
        var a = Vector256.Abs(x);
        var half = Vector256.Create(0.5) * z;
        var product = (z * r) - (x * y);
        var small = Vector256.Create(1.0) - (half - product);
        var quarter = Vector256.ConditionalSelect(
            Vector256.GreaterThanOrEqual(a, Vector256.Create(LargeCosine)),
            Vector256.Create(0.28125),
            ((a.AsInt64() - Vector256.Create(QuarterExponent)) & Vector256.Create(HighWord)).AsDouble());
        var large = (Vector256.Create(1.0) - quarter) - ((half - quarter) - product);
        return Vector256.ConditionalSelect(Vector256.LessThan(a, Vector256.Create(SmallCosine)), small, large);
    }
}
