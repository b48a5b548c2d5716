using Sweeps.Core.Analysis;
using Sweeps.Core.Models;
using Sweeps.Engine.Planning;
using Sweeps.Engine.Specs;

namespace Sweeps.Cli.Output;

/// <summary>The report of <c>sweeps check</c>.</summary>
internal static class CheckText
{
    public static void Write(SweepSpec spec, CostEstimate estimate, DiskEstimate? disk, ChunkPlan plan, int cores, TextWriter output, string? diskProblem = null)
    {
        var model = spec.Model;
        output.WriteLine($"{spec.SourceFile}: valid");
        output.WriteLine($"model         {(model.Kind == ModelKind.Map ? "map" : "flow")}, variables {string.Join(", ", model.Variables)}; parameters {(model.Parameters.Count == 0 ? "none" : string.Join(", ", model.Parameters))}");
        foreach (var axis in spec.Grid.Axes)
        {
            var what = axis.Target == AxisTarget.Parameter ? "parameter" : "initial value";
            var range = axis.Values is null
                ? $"{Numbers.Format(axis.From)} … {Numbers.Format(axis.To)}, {axis.Count} {(axis.Spacing == AxisSpacing.Log ? "log-spaced" : "linear")} steps"
                : $"{axis.Count} listed values";
            output.WriteLine($"axis          {axis.Name} ({what}): {range}");
        }

        var analysis = spec.Analysis;
        var lyapunov = analysis.Lyapunov switch
        {
            LyapunovMode.Spectrum => "full spectrum",
            LyapunovMode.Largest => "largest exponent",
            _ => "no exponents",
        };
        output.WriteLine($"analysis      transient {analysis.Transient}, measure {analysis.Measure}, {lyapunov}, periods up to {analysis.MaxPeriod}");
        output.WriteLine($"points        {plan.Points:N0}");
        output.WriteLine($"chunks        {plan.ChunkCount:N0} of up to {plan.ChunkSize:N0} points");
        var wall = estimate.TotalCpuSeconds / Math.Max(1, cores);
        output.WriteLine($"estimate      {Numbers.Format(estimate.SecondsPerPoint * 1e6, "g3")} µs per point (timed on {estimate.SampledPoints} points); {Duration(estimate.TotalCpuSeconds)} of compute, about {Duration(wall)} on {cores} core{(cores == 1 ? "" : "s")}");
        if (disk is null)
        {
            output.WriteLine($"disk          not estimated: {diskProblem ?? "no sample written"}");
            return;
        }

        output.WriteLine($"disk          about {Size(disk.TotalBytes)} in {plan.ChunkCount:N0} part{(plan.ChunkCount == 1 ? "" : "s")} ({Numbers.Format(disk.BytesPerPoint, "g3")} bytes per point, written for {disk.SampledPoints} points)");
    }

    private static string Size(double bytes) => bytes switch
    {
        < 1 << 10 => $"{Numbers.Format(bytes, "g3")} bytes",
        < 1 << 20 => $"{Numbers.Format(bytes / (1 << 10), "g3")} KiB",
        < 1 << 30 => $"{Numbers.Format(bytes / (1 << 20), "g3")} MiB",
        _ => $"{Numbers.Format(bytes / (1L << 30), "g3")} GiB",
    };

    private static string Duration(double seconds) => seconds switch
    {
        < 1 => $"{Numbers.Format(seconds * 1000, "g3")} ms",
        < 120 => $"{Numbers.Format(seconds, "g3")} s",
        < 7200 => $"{Numbers.Format(seconds / 60, "g3")} min",
        _ => $"{Numbers.Format(seconds / 3600, "g3")} h",
    };
}
