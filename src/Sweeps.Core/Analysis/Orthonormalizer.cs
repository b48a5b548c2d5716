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
        if (n == 2 && k == 2 && columns.Length >= 4 && norms.Length >= 2)
        {
            return Orthonormalize2(columns, norms);
        }

        return OrthonormalizeGeneral(columns, n, k, norms);
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    internal static bool OrthonormalizeGeneral(Span<double> columns, int n, int k, Span<double> norms)
    {
        // Plain indices into one span rather than a slice per column: the same operations in the same order,
        // about twice as fast for the small n of most models (slices in nested loops defeat the JIT).
        for (var c = 0; c < k; c++)
        {
            var column = c * n;
            for (var previous = 0; previous < c; previous++)
            {
                var basis = previous * n;
                var dot = 0.0;
                for (var i = 0; i < n; i++)
                {
                    dot += columns[basis + i] * columns[column + i];
                }

                for (var i = 0; i < n; i++)
                {
                    columns[column + i] -= dot * columns[basis + i];
                }
            }

            var square = 0.0;
            for (var i = 0; i < n; i++)
            {
                square += columns[column + i] * columns[column + i];
            }

            var norm = Math.Sqrt(square);
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
                columns[column + i] *= inverse;
            }
        }

        return true;
    }

    /// <summary>Two vectors of two components: the general loop's operations in its order, unrolled.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static bool Orthonormalize2(Span<double> columns, Span<double> norms)
    {
        var (a0, a1) = (columns[0], columns[1]);
        var norm = Math.Sqrt(0.0 + (a0 * a0) + (a1 * a1));
        if (!double.IsFinite(norm) || norm == 0)
        {
            return General(columns, norms);
        }

        var inverse = 1.0 / norm;
        (a0, a1) = (a0 * inverse, a1 * inverse);
        var (b0, b1) = (columns[2], columns[3]);
        var dot = 0.0 + (a0 * b0) + (a1 * b1);
        b0 -= dot * a0;
        b1 -= dot * a1;
        var second = Math.Sqrt(0.0 + (b0 * b0) + (b1 * b1));
        if (!double.IsFinite(second) || second == 0)
        {
            return General(columns, norms);
        }

        var inverseSecond = 1.0 / second;
        (columns[0], columns[1], columns[2], columns[3]) = (a0, a1, b0 * inverseSecond, b1 * inverseSecond);
        (norms[0], norms[1]) = (norm, second);
        return true;

        // A collapsed or non-finite vector: the general path handles it (nothing was written yet).
        static bool General(Span<double> columns, Span<double> norms) => OrthonormalizeGeneral(columns, 2, 2, norms);
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
