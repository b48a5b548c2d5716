using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using Sweeps.Core.Analysis;

namespace Sweeps.Core.Kernels;

/// <summary>Lane-wise forms of the scalar analyzers' per-step tests and bookkeeping, shared by the block analyzers.</summary>
internal static class LaneMath
{
    /// <summary>Lanes (bits 0–3) where one of the first <paramref name="count"/> components is beyond ±<paramref name="escape"/> or not finite — <see cref="PointResult.Bounded"/> on each lane.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static int Escaped(Vector256<double>[] values, int count, double escape)
    {
        var bound = Vector256.Create(escape);
        var inside = Vector256<double>.AllBitsSet;
        for (var i = 0; i < count; i++)
        {
            inside &= Vector256.LessThanOrEqual(Vector256.Abs(values[i]), bound);
        }

        return (int)~inside.ExtractMostSignificantBits() & 0xF;
    }

    /// <summary>
    /// <see cref="Math.Max(double, double)"/> on each lane for values that are not −0: NaN where either value is NaN,
    /// the larger otherwise (the bare vector maximum may return the other operand when one is NaN).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vector256<double> Maximum(Vector256<double> a, Vector256<double> b) =>
        Vector256.ConditionalSelect(Vector256.Equals(a, a) & Vector256.Equals(b, b), Vector256.Max(a, b), a + b);

    /// <summary>All bits set in the lanes of <paramref name="lanes"/> (bits 0–3), clear in the others.</summary>
    public static Vector256<double> Mask(int lanes) =>
        Vector256.Create((lanes & 1) != 0 ? -1L : 0, (lanes & 2) != 0 ? -1L : 0, (lanes & 4) != 0 ? -1L : 0, (lanes & 8) != 0 ? -1L : 0).AsDouble();

    /// <summary>A running product split into mantissa (returned) and binary exponent (added to <paramref name="exponent"/>): <see cref="MapAnalyzer.Split"/> on each lane, exact.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vector256<double> Split(Vector256<double> value, ref Vector256<long> exponent)
    {
        var bits = value.AsInt64();
        exponent += Vector256.ShiftRightLogical(bits, 52) - Vector256.Create(1023L);
        return ((bits & Vector256.Create(MapAnalyzer.MantissaBits)) | Vector256.Create(MapAnalyzer.OneBits)).AsDouble();
    }
}
