using System.Globalization;

namespace Sweeps.Core.Analysis;

/// <summary>
/// The check for transients too short, the usual way regime maps go wrong near bifurcations and in
/// narrow windows: each point is analysed with the configured transient and again with twice that;
/// when the two disagree on the regime or the period the point is unresolved with reason
/// "transient: …". The reported numbers are those of the longer run, which are the better converged.
/// </summary>
public sealed class TransientCheckedAnalyzer(IPointAnalyzer normal, IPointAnalyzer doubled) : IPointAnalyzer
{
    public PointResult Analyze(ReadOnlySpan<double> initial, double[] parameters)
    {
        var first = normal.Analyze(initial, parameters);
        var second = doubled.Analyze(initial, parameters);
        if (first.Regime == second.Regime && first.Period == second.Period)
        {
            return second;
        }

        return second with
        {
            Regime = Regime.Unresolved,
            Period = 0,
            Cycle = [],
            Reason = string.Create(
                CultureInfo.InvariantCulture,
                $"transient: {Describe(first)} after the configured transient, {Describe(second)} after twice that"),
        };
    }

    private static string Describe(PointResult result) =>
        result.Period > 0 ? $"{result.Regime.ToText()} (period {result.Period})" : result.Regime.ToText();
}
