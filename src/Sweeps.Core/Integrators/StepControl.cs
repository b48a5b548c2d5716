using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;

namespace Sweeps.Core.Integrators;

/// <summary>
/// The Dormand–Prince step-size rule: after a step of error norm e the next step is h·0.9·e^(−1/5), the factor kept
/// within [0.2, 5] (common practice for embedded pairs of order 5(4)). The fifth root is computed here rather than by
/// the platform's power function, because speed demands it: per lane of the block analyzer the power cost a tenth of
/// the whole analysis, and four lanes share one vector evaluation here with each lane's bits those of the scalar
/// evaluation (straight-line IEEE arithmetic, no fused multiply-add, nothing a lane's neighbours can change). The root
/// is e = m·2^k (m ∈ [1, 2)) → m^(−1/5)·2^(−k/5): two Newton steps y ← y·(6 − m·y⁵)/5 from a quadratic first guess
/// good to 1.1·10⁻³ (each step squares the error, times three), and 2^(−k/5) as a power of two times one of five
/// constants; within 10⁻¹⁰ of the platform's power (tested) — the rule is a heuristic, and what matters is that every
/// lane and the scalar stepper take the same steps. Factors at their caps are returned without the root: at or below e = 1.8·10⁻⁴ the factor is above
/// 5.04, at or above 2000 below 0.197.
/// </summary>
internal static class StepControl
{
    private const double GrowthCapped = 1.8e-4;
    private const double ShrinkageCapped = 2000;

    // 2^(−r/5), r = 1 … 4, to the nearest double.
    private const double Fifth1 = 0.8705505632961241, Fifth2 = 0.757858283255199, Fifth3 = 0.6597539553864471, Fifth4 = 0.5743491774985174;
    private static readonly double[] FifthPowers = [1.0, Fifth1, Fifth2, Fifth3, Fifth4];

    private const long MantissaBits = 0x000FFFFFFFFFFFFF;
    private const long OneBits = 0x3FF0000000000000;

    /// <summary>The factor after an accepted step, error norm 0 ≤ <paramref name="error"/> ≤ 1: 0.9·e^(−1/5), at most 5.</summary>
    public static double Growth(double error) => error <= GrowthCapped ? 5.0 : Growth(error, InverseFifthRoot(error));

    /// <summary><see cref="Growth(double)"/> from the root computed already (by the four-lane form).</summary>
    public static double Growth(double error, double root) => error <= GrowthCapped ? 5.0 : Math.Min(5.0, 0.9 * root);

    /// <summary>The factor after a rejected step, finite error norm <paramref name="error"/> &gt; 1: 0.9·e^(−1/5), at least 0.2.</summary>
    public static double Shrinkage(double error) => error >= ShrinkageCapped ? 0.2 : Shrinkage(error, InverseFifthRoot(error));

    /// <summary><see cref="Shrinkage(double)"/> from the root computed already (by the four-lane form).</summary>
    public static double Shrinkage(double error, double root) => error >= ShrinkageCapped ? 0.2 : Math.Max(0.2, 0.9 * root);

    /// <summary>e^(−1/5) for a positive normal <paramref name="e"/> (the rule's range, 1.8·10⁻⁴ to 2000, is well inside).</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static double InverseFifthRoot(double e)
    {
        var bits = BitConverter.DoubleToInt64Bits(e);
        var k = (double)((bits >> 52) - 1023);
        var m = BitConverter.Int64BitsToDouble((bits & MantissaBits) | OneBits);
        var q = Math.Floor(k * 0.2);
        var r = k - (5 * q);
        var y = Newton(Newton(Guess(m), m), m);
        var scale = BitConverter.Int64BitsToDouble((1023 - (long)q) << 52);
        return y * FifthPowers[(int)r] * scale;
    }

    /// <summary><see cref="InverseFifthRoot(double)"/> of each lane (lanes outside its range give values that are not used).</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static Vector256<double> InverseFifthRoot(Vector256<double> e)
    {
        var bits = e.AsInt64();

        // The biased exponent as a double: its bits put under the mantissa of 2^52 (exact), less 2^52 + 1023.
        var biased = (Vector256.ShiftRightLogical(bits, 52) | Vector256.Create(0x4330000000000000L)).AsDouble();
        var k = biased - Vector256.Create(4503599627370496.0 + 1023);
        var m = ((bits & Vector256.Create(MantissaBits)) | Vector256.Create(OneBits)).AsDouble();
        var q = Vector256.Floor(k * Vector256.Create(0.2));
        var r = k - (Vector256.Create(5.0) * q);
        var y = Newton(Newton(Guess(m), m), m);

        // 2^(−q) from q's bits (q + 1.5·2^52 holds the small integer q, of either sign, in its low bits), and 2^(−r/5)
        // chosen by r.
        var qBits = (q + Vector256.Create(6755399441055744.0)).AsInt64() - Vector256.Create(0x4338000000000000L);
        var scale = Vector256.ShiftLeft(Vector256.Create(1023L) - qBits, 52).AsDouble();
        var power = Vector256.ConditionalSelect(Vector256.Equals(r, Vector256.Create(1.0)), Vector256.Create(Fifth1), Vector256<double>.One);
        power = Vector256.ConditionalSelect(Vector256.Equals(r, Vector256.Create(2.0)), Vector256.Create(Fifth2), power);
        power = Vector256.ConditionalSelect(Vector256.Equals(r, Vector256.Create(3.0)), Vector256.Create(Fifth3), power);
        power = Vector256.ConditionalSelect(Vector256.Equals(r, Vector256.Create(4.0)), Vector256.Create(Fifth4), power);

        return y * power * scale;
    }

    // m^(−1/5) on [1, 2) to 1.1·10⁻³: the quadratic through the three Chebyshev nodes of the interval.
    private const double G0 = 0.9989056286988931, G1 = -0.1535954344343306, G2 = 0.051739680043450406;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double Guess(double m) => G0 + ((m - 1.0) * (G1 + (G2 * (m - 1.5))));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static Vector256<double> Guess(Vector256<double> m) =>
        Vector256.Create(G0) + ((m - Vector256.Create(1.0)) * (Vector256.Create(G1) + (Vector256.Create(G2) * (m - Vector256.Create(1.5)))));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double Newton(double y, double m)
    {
        var y2 = y * y;
        var y5 = y2 * y2 * y;
        return y * (6.0 - (m * y5)) * 0.2;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static Vector256<double> Newton(Vector256<double> y, Vector256<double> m)
    {
        var y2 = y * y;
        var y5 = y2 * y2 * y;
        return y * (Vector256.Create(6.0) - (m * y5)) * Vector256.Create(0.2);
    }
}
