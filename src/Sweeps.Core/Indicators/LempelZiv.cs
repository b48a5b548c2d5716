namespace Sweeps.Core.Indicators;

/// <summary>
/// The Lempel–Ziv complexity of a finite symbol sequence (Lempel &amp; Ziv, IEEE Trans. Inf. Theory 22
/// (1976) 75–81): the number of phrases of its exhaustive history, each phrase the shortest piece not
/// producible by copying from what came before. Counted with the scheme of Kaspar &amp; Schuster (1987).
/// A deterministic chaotic orbit's itinerary is incompressible: its normalised complexity
/// c·log2(n)/n approaches 1, while a periodic itinerary's tends to 0.
/// </summary>
public static class LempelZiv
{
    public static int Phrases(ReadOnlySpan<byte> s)
    {
        var n = s.Length;
        if (n == 0)
        {
            return 0;
        }

        int c = 1, l = 1, i = 0, k = 1, kMax = 1;
        while (true)
        {
            if (s[i + k - 1] == s[l + k - 1])
            {
                k++;
                if (l + k > n)
                {
                    c++;
                    break;
                }
            }
            else
            {
                kMax = Math.Max(k, kMax);
                i++;
                if (i == l)
                {
                    c++;
                    l += kMax;
                    if (l + 1 > n)
                    {
                        break;
                    }

                    i = 0;
                    k = 1;
                    kMax = 1;
                }
                else
                {
                    k = 1;
                }
            }
        }

        return c;
    }

    /// <summary>The itinerary of a series about its median (1 above, 0 otherwise) and its normalised complexity c·log2(n)/n.</summary>
    public static double NormalisedComplexity(ReadOnlySpan<double> series)
    {
        if (series.Length < 2)
        {
            return double.NaN;
        }

        var sorted = series.ToArray();
        Array.Sort(sorted);
        var median = sorted[sorted.Length / 2];
        var symbols = new byte[series.Length];
        for (var i = 0; i < symbols.Length; i++)
        {
            symbols[i] = series[i] > median ? (byte)1 : (byte)0;
        }

        var n = symbols.Length;
        return Phrases(symbols) * Math.Log2(n) / n;
    }
}
