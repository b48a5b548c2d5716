using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;

namespace Sweeps.Core.Kernels;

/// <summary>
/// The QR step of <see cref="Analysis.Orthonormalizer"/> on four points side by side: modified Gram–Schmidt with the
/// scalar code's operations in its order, lane-wise, so each lane gets the scalar bits wherever the scalar code takes
/// its ordinary path. Lanes where a norm is zero (a superstable direction) or not finite are reported, not repaired:
/// the caller gives them to the scalar code, which handles both.
/// </summary>
internal static class LaneOrthonormalizer
{
    /// <summary>
    /// Orthonormalises the k columns of length n stored from <paramref name="offset"/> on (column c at offset + c·n)
    /// and writes the norms; returns the lanes (bits 0–3) where a norm was zero or not finite.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static int Orthonormalize(Vector256<double>[] columns, int offset, int n, int k, Vector256<double>[] norms)
    {
        var unusual = 0;
        for (var c = 0; c < k; c++)
        {
            var column = offset + (c * n);
            for (var previous = 0; previous < c; previous++)
            {
                var basis = offset + (previous * n);
                var dot = Vector256<double>.Zero;
                for (var i = 0; i < n; i++)
                {
                    dot += columns[basis + i] * columns[column + i];
                }

                for (var i = 0; i < n; i++)
                {
                    columns[column + i] -= dot * columns[basis + i];
                }
            }

            var square = Vector256<double>.Zero;
            for (var i = 0; i < n; i++)
            {
                square += columns[column + i] * columns[column + i];
            }

            var norm = Vector256.Sqrt(square);
            var ordinary = Vector256.Equals(norm - norm, Vector256<double>.Zero) & ~Vector256.Equals(norm, Vector256<double>.Zero);
            unusual |= (int)~ordinary.ExtractMostSignificantBits() & 0xF;
            norms[c] = norm;
            var inverse = Vector256<double>.One / norm;
            for (var i = 0; i < n; i++)
            {
                columns[column + i] *= inverse;
            }
        }

        return unusual;
    }
}
