using System.Runtime.CompilerServices;

namespace Sweeps.Core.Analysis;

/// <summary>
/// Modified Gram–Schmidt on k tangent vectors of length n stored column by column in one array
/// (column c occupies [c*n, c*n + n)). This is the re-orthonormalisation step of the Benettin/QR
/// method (Benettin, Galgani, Giorgilli &amp; Strelcyn, Meccanica 15, 1980; Shimada &amp; Nagashima,
/// Prog. Theor. Phys. 61, 1979): the logarithms of the diagonal of R accumulate to the exponents.
/// It reports the norms themselves, so that callers can multiply them up and take logarithms rarely.
/// Hand-written because it runs every step and must not allocate.
/// </summary>
internal static class Orthonormalizer
{
    /// <summary>
    /// Orthonormalises the columns in place and writes |R_cc| into <paramref name="norms"/>. A column
    /// that collapses to exactly zero (a superstable direction) gets norm 0 (ln 0 = −∞) and is replaced by
    /// a unit vector orthogonal to the others, so later steps stay finite. Returns false if a norm is not finite.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static bool Orthonormalize(Span<double> columns, int n, int k, Span<double> norms)
    {
        for (var c = 0; c < k; c++)
        {
            var column = columns.Slice(c * n, n);
            for (var previous = 0; previous < c; previous++)
            {
                var basis = columns.Slice(previous * n, n);
                var dot = Dot(basis, column);
                for (var i = 0; i < n; i++)
                {
                    column[i] -= dot * basis[i];
                }
            }

            var norm = Math.Sqrt(Dot(column, column));
            if (!double.IsFinite(norm))
            {
                return false;
            }

            if (norm == 0)
            {
                norms[c] = 0;
                ReplaceWithOrthogonalUnit(columns, n, c);
                continue;
            }

            norms[c] = norm;
            var inverse = 1.0 / norm;
            for (var i = 0; i < n; i++)
            {
                column[i] *= inverse;
            }
        }

        return true;
    }

    private static void ReplaceWithOrthogonalUnit(Span<double> columns, int n, int c)
    {
        var column = columns.Slice(c * n, n);
        for (var axis = 0; axis < n; axis++)
        {
            column.Clear();
            column[axis] = 1.0;
            for (var previous = 0; previous < c; previous++)
            {
                var basis = columns.Slice(previous * n, n);
                var dot = Dot(basis, column);
                for (var i = 0; i < n; i++)
                {
                    column[i] -= dot * basis[i];
                }
            }

            var norm = Math.Sqrt(Dot(column, column));
            if (norm > 0.5)
            {
                for (var i = 0; i < n; i++)
                {
                    column[i] /= norm;
                }

                return;
            }
        }
    }

    private static double Dot(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        var sum = 0.0;
        for (var i = 0; i < a.Length; i++)
        {
            sum += a[i] * b[i];
        }

        return sum;
    }
}
