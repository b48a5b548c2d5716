namespace Sweeps.Core.Indicators;

/// <summary>
/// Second-opinion chaos indicators of one orbit: the 0–1 test's K, the permutation entropy (order 4,
/// nats) and the normalised Lempel–Ziv complexity of the itinerary about the median.
/// </summary>
public sealed record IndicatorValues(double K, double PermutationEntropy, double LempelZiv)
{
    public static IndicatorValues Of(ReadOnlySpan<double> series) =>
        new(ZeroOneTest.K(series), Indicators.PermutationEntropy.Compute(series, 4), Indicators.LempelZiv.NormalisedComplexity(series));

    /// <summary>Why the indicators disagree with the regime decided from the exponents, or null when they agree.</summary>
    public string? Disagreement(Analysis.Regime regime)
    {
        var chaotic = regime is Analysis.Regime.Chaotic or Analysis.Regime.Hyperchaotic;
        var regular = regime is Analysis.Regime.FixedPoint or Analysis.Regime.Periodic or Analysis.Regime.QuasiPeriodic;
        var k = K.ToString("g3", System.Globalization.CultureInfo.InvariantCulture);
        return chaotic && K < 0.5 ? $"indicators disagree: 0-1 test K = {k} suggests regular motion despite a positive exponent"
            : regular && K > 0.5 ? $"indicators disagree: 0-1 test K = {k} suggests chaos"
            : null;
    }
}
