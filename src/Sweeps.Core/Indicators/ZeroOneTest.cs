namespace Sweeps.Core.Indicators;

/// <summary>
/// The 0–1 test for chaos (Gottwald &amp; Melbourne, Proc. R. Soc. Lond. A 460 (2004) 603–611; the
/// correlation method and the median over frequencies of SIAM J. Appl. Dyn. Syst. 8 (2009) 129–145):
/// K ≈ 0 for regular dynamics, K ≈ 1 for chaotic. The frequencies c are drawn from (π/5, 4π/5) with a
/// fixed seed, so the result depends only on the series.
/// </summary>
public static class ZeroOneTest
{
    private const int Frequencies = 100;

    public static double K(ReadOnlySpan<double> series)
    {
        var n = series.Length;
        if (n < 40)
        {
            return double.NaN;
        }

        var mean = 0.0;
        foreach (var value in series)
        {
            mean += value;
        }

        mean /= n;

        // A constant series (a fixed point, or a cycle seen once per period) is regular: K = 0. The test's
        // displacement would be rounding noise, whose correlation with time is arbitrary.
        var spread = 0.0;
        foreach (var value in series)
        {
            spread = Math.Max(spread, Math.Abs(value - mean));
        }

        if (spread <= 1e-9 * (1 + Math.Abs(mean)))
        {
            return 0;
        }

        var random = new Random(2004);
        var results = new double[Frequencies];
        var p = new double[n + 1];
        var q = new double[n + 1];
        var cut = n / 10;
        var d = new double[cut];
        for (var f = 0; f < Frequencies; f++)
        {
            var c = (Math.PI / 5) + (random.NextDouble() * 3 * Math.PI / 5);
            for (var j = 0; j < n; j++)
            {
                p[j + 1] = p[j] + (series[j] * Math.Cos((j + 1) * c));
                q[j + 1] = q[j] + (series[j] * Math.Sin((j + 1) * c));
            }

            for (var lag = 1; lag <= cut; lag++)
            {
                var sum = 0.0;
                var count = n - lag;
                for (var j = 1; j <= count; j++)
                {
                    var dp = p[j + lag] - p[j];
                    var dq = q[j + lag] - q[j];
                    sum += (dp * dp) + (dq * dq);
                }

                // The modified mean-square displacement: subtract the oscillatory term of a regular signal.
                var oscillation = mean * mean * (1 - Math.Cos(lag * c)) / (1 - Math.Cos(c));
                d[lag - 1] = (sum / count) - oscillation;
            }

            results[f] = Correlation(d);
        }

        Array.Sort(results);
        return (results[(Frequencies / 2) - 1] + results[Frequencies / 2]) / 2;
    }

    /// <summary>Pearson correlation of the sequence with its index 1, 2, ….</summary>
    private static double Correlation(double[] values)
    {
        var n = values.Length;
        var (meanIndex, meanValue) = ((n + 1) / 2.0, values.Average());
        var (covariance, varianceIndex, varianceValue) = (0.0, 0.0, 0.0);
        for (var i = 0; i < n; i++)
        {
            var a = i + 1 - meanIndex;
            var b = values[i] - meanValue;
            covariance += a * b;
            varianceIndex += a * a;
            varianceValue += b * b;
        }

        return varianceValue == 0 ? 0 : covariance / Math.Sqrt(varianceIndex * varianceValue);
    }
}
