using Sweeps.Engine.Runs;

namespace Sweeps.Cli.Output;

/// <summary>Text forms of a run summary, shared by run, inspect and status.</summary>
internal static class SummaryText
{
    // Both written as plain loops: LINQ's ordering and projection over key–value pairs are generic code that no precompiled
    // image holds, compiled at the end of every run just to print these two lines (18 methods, 8 ms).

    /// <summary>The regimes by decreasing count (ties by name), each with its count.</summary>
    public static string Regimes(RunSummary summary)
    {
        if (summary.Regimes.Count == 0)
        {
            return "none yet";
        }

        var names = new List<string>(summary.Regimes.Count);
        foreach (var entry in summary.Regimes)
        {
            names.Add(entry.Key);
        }

        names.Sort((a, b) => summary.Regimes[b].CompareTo(summary.Regimes[a]) is var order and not 0 ? order : string.CompareOrdinal(a, b));
        var text = new System.Text.StringBuilder();
        foreach (var name in names)
        {
            text.Append(text.Length == 0 ? "" : "  ").Append($"{name} {summary.Regimes[name]:N0}");
        }

        return text.ToString();
    }

    /// <summary>The first 16 periods in the summary's order, each with its count.</summary>
    public static string Periods(RunSummary summary)
    {
        if (summary.Periods.Count == 0)
        {
            return "none";
        }

        var text = new System.Text.StringBuilder();
        var shown = 0;
        foreach (var entry in summary.Periods)
        {
            if (shown++ == 16)
            {
                return text.Append("  …").ToString();
            }

            text.Append(text.Length == 0 ? "" : "  ").Append($"{entry.Key}: {entry.Value:N0}");
        }

        return text.ToString();
    }

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

    public static string Missing(RunSummary summary) => summary.MissingChunks.Count == 0 ? "none" : Chunks(summary.MissingChunks);

    /// <summary>Chunk numbers, the first twelve and how many in all.</summary>
    public static string Chunks(IReadOnlyList<long> chunks) =>
        string.Join(", ", chunks.Take(12)) + (chunks.Count > 12 ? $", … ({chunks.Count} in all)" : "");

    public static void Line(TextWriter output, string label, string value) => output.WriteLine($"{label,-14}{value}");
}
