using System.Globalization;

namespace Sweeps.Core.Analysis;

/// <summary>
/// A point analysed twice, the second time more carefully — twice the transient (transients too short
/// are the usual way regime maps go wrong near bifurcations and in narrow windows) or half the
/// integration step (the step can change the answer). When the two disagree on the regime or the
/// period, the point is unresolved with the reason "<see cref="Check"/>: …". The reported numbers are
/// those of the careful run.
/// </summary>
public sealed class CrossCheckedAnalyzer(IPointAnalyzer normal, IPointAnalyzer careful, string check, string description) : IPointAnalyzer
{
    /// <summary>The reason's first word: "transient" or "step".</summary>
    public string Check => check;

    public PointResult Analyze(ReadOnlySpan<double> initial, double[] parameters)
    {
        var first = normal.Analyze(initial, parameters);
        var second = careful.Analyze(initial, parameters);
        if (first.Regime == second.Regime && first.Period == second.Period)
        {
            return second;
        }

        return second with
        {
            Regime = Regime.Unresolved,
            Period = 0,
            Cycle = [],
            Reason = string.Create(CultureInfo.InvariantCulture, $"{check}: {Describe(first)} as configured, {Describe(second)} with {description}"),
        };
    }

    private static string Describe(PointResult result) =>
        result.Period > 0 ? $"{result.Regime.ToText()} (period {result.Period})" : result.Regime.ToText();
}
