using System.Numerics;
using System.Runtime.CompilerServices;
using MathNet.Numerics.LinearAlgebra;

namespace Sweeps.Core.Analysis;

/// <summary>Row-major n×n helpers for the analyzers: products, ln|det| and eigenvalues.</summary>
internal static class SmallMatrix
{
    /// <summary>result = a·b (all n×n, row-major); result must not alias a or b.</summary>
    public static void Multiply(ReadOnlySpan<double> a, ReadOnlySpan<double> b, Span<double> result, int n)
    {
        for (var i = 0; i < n; i++)
        {
            for (var j = 0; j < n; j++)
            {
                var sum = 0.0;
                for (var k = 0; k < n; k++)
                {
                    sum += a[(i * n) + k] * b[(k * n) + j];
                }

                result[(i * n) + j] = sum;
            }
        }
    }

    /// <summary>
    /// |det m| by Gaussian elimination with partial pivoting, as the product of the pivots' magnitudes (no
    /// logarithms: the map analyzer multiplies these up and takes a logarithm now and then); destroys <paramref name="m"/>.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static double AbsDeterminant(Span<double> m, int n)
    {
        var product = 1.0;
        for (var column = 0; column < n; column++)
        {
            var pivot = column;
            for (var row = column + 1; row < n; row++)
            {
                if (Math.Abs(m[(row * n) + column]) > Math.Abs(m[(pivot * n) + column]))
                {
                    pivot = row;
                }
            }

            var value = m[(pivot * n) + column];
            if (value == 0)
            {
                return 0;
            }

            if (pivot != column)
            {
                for (var j = 0; j < n; j++)
                {
                    (m[(pivot * n) + j], m[(column * n) + j]) = (m[(column * n) + j], m[(pivot * n) + j]);
                }
            }

            product *= Math.Abs(value);
            for (var row = column + 1; row < n; row++)
            {
                var factor = m[(row * n) + column] / value;
                for (var j = column; j < n; j++)
                {
                    m[(row * n) + j] -= factor * m[(column * n) + j];
                }
            }
        }

        return product;
    }

    /// <summary>Eigenvalues of a row-major n×n matrix (MathNet.Numerics' EVD), sorted by decreasing modulus.</summary>
    public static Complex[] Eigenvalues(ReadOnlySpan<double> m, int n)
    {
        var values = m.ToArray();
        var matrix = Matrix<double>.Build.Dense(n, n, (i, j) => values[(i * n) + j]);
        return matrix.Evd().EigenValues
            .OrderByDescending(v => v.Magnitude)
            .ThenByDescending(v => v.Real)
            .ThenByDescending(v => v.Imaginary)
            .ToArray();
    }

    /// <summary>Largest eigenvalue modulus; closed form for n ≤ 2.</summary>
    public static double SpectralRadius(ReadOnlySpan<double> m, int n)
    {
        if (n == 1)
        {
            return Math.Abs(m[0]);
        }

        if (n == 2)
        {
            var trace = m[0] + m[3];
            var determinant = (m[0] * m[3]) - (m[1] * m[2]);
            var discriminant = (trace * trace) - (4 * determinant);
            if (discriminant < 0)
            {
                return Math.Sqrt(Math.Abs(determinant));
            }

            var root = Math.Sqrt(discriminant);
            return Math.Max(Math.Abs((trace + root) / 2), Math.Abs((trace - root) / 2));
        }

        return Eigenvalues(m, n)[0].Magnitude;
    }
}
