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
