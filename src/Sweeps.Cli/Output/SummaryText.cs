using Sweeps.Engine.Runs;

namespace Sweeps.Cli.Output;

/// <summary>Text forms of a run summary, shared by run, inspect and status.</summary>
internal static class SummaryText
{
    public static string Regimes(RunSummary summary) =>
        summary.Regimes.Count == 0
            ? "none yet"
            : string.Join("  ", summary.Regimes.OrderByDescending(r => r.Value).ThenBy(r => r.Key, StringComparer.Ordinal).Select(r => $"{r.Key} {r.Value:N0}"));

    public static string Periods(RunSummary summary) =>
        summary.Periods.Count == 0
            ? "none"
            : string.Join("  ", summary.Periods.Take(16).Select(p => $"{p.Key}: {p.Value:N0}")) + (summary.Periods.Count > 16 ? "  …" : "");

    /// <summary>The lines about coexisting attractors, when a run has any to report (several starts or a continuation sweep).</summary>
    public static void Multistability(TextWriter output, RunSummary summary)
    {
        if (summary.HysteresisPoints is { } hysteretic)
        {
            Line(output, "hysteresis", $"{hysteretic:N0} points (the forward and backward sweeps end on different attractors)");
        }
        else if (summary.MultistablePoints > 0)
        {
            Line(output, "multistable", $"{summary.MultistablePoints:N0} points reached more than one attractor from their starts");
        }
    }

    public static string Range(RunSummary summary) =>
        double.IsNaN(summary.LargestExponentMin)
            ? "not computed"
            : $"{Numbers.Format(summary.LargestExponentMin)} … {Numbers.Format(summary.LargestExponentMax)}";

    public static string Missing(RunSummary summary) =>
        summary.MissingChunks.Count == 0
            ? "none"
            : string.Join(", ", summary.MissingChunks.Take(12)) + (summary.MissingChunks.Count > 12 ? $", … ({summary.MissingChunks.Count} in all)" : "");

    public static void Line(TextWriter output, string label, string value) => output.WriteLine($"{label,-14}{value}");
}
