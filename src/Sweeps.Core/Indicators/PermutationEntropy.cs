namespace Sweeps.Core.Indicators;

/// <summary>
/// Permutation entropy (Bandt &amp; Pompe, Phys. Rev. Lett. 88 (2002) 174102): the Shannon entropy, in
/// nats, of the ordinal patterns of <c>order</c> consecutive values. It is ln(order!) for i.i.d. noise
/// and 0 for a monotone series. Ties are ranked by position.
/// </summary>
public static class PermutationEntropy
{
    public static double Compute(ReadOnlySpan<double> series, int order = 4)
    {
        if (order is < 2 or > 8)
        {
            throw new ArgumentOutOfRangeException(nameof(order), "order must be 2 to 8");
        }

        var windows = series.Length - order + 1;
        if (windows < 1)
        {
            return double.NaN;
        }

        var counts = new Dictionary<int, int>();
        for (var start = 0; start < windows; start++)
        {
            // Lehmer code of the pattern: for each element, how many later ones are smaller.
            var code = 0;
            for (var i = 0; i < order; i++)
            {
                var smaller = 0;
                for (var j = i + 1; j < order; j++)
                {
                    if (series[start + j] < series[start + i])
                    {
                        smaller++;
                    }
                }

                code = (code * (order - i)) + smaller;
            }

            counts[code] = counts.GetValueOrDefault(code) + 1;
        }

        var entropy = 0.0;
        foreach (var count in counts.Values)
        {
            var probability = (double)count / windows;
            entropy -= probability * Math.Log(probability);
        }

        return entropy;
    }
}
