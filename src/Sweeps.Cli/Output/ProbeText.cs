using Sweeps.Core.Analysis;
using Sweeps.Core.Models;
using Sweeps.Engine.Probing;

namespace Sweeps.Cli.Output;

/// <summary>The human-readable probe report: a label column and values, fixed points last.</summary>
internal static class ProbeText
{
    private const int Label = 14;

    public static void Write(ProbeReport report, TextWriter output)
    {
        var model = report.Model;
        var result = report.Result;
        foreach (var note in report.Notes)
        {
            output.WriteLine($"note: {note}");
        }

        if (model.Parameters.Count > 0)
        {
            Line(output, "parameters", Numbers.Assignments(model.Parameters, report.Parameters));
        }

        Line(output, "start", Numbers.Assignments(model.Variables, report.Initial));
        Line(output, "regime", result.Regime.ToText());
        if (result.Reason is { } reason)
        {
            Line(output, "reason", reason);
        }

        Line(output, "period", PeriodText(report));
        if (result.Period > 1)
        {
            for (var i = 0; i < result.Cycle.Count; i++)
            {
                Line(output, i == 0 ? "cycle" : "", Numbers.Assignments(model.Variables, result.Cycle[i]));
            }
        }

        WriteExponents(output, result, model.Kind);
        if (result.Indicators is { } indicators)
        {
            Line(output, "indicators", $"0-1 test K = {Numbers.Format(indicators.K, "g3")}; permutation entropy {Numbers.Format(indicators.PermutationEntropy, "g3")} (max ln 24 = 3.18); Lempel-Ziv {Numbers.Format(indicators.LempelZiv, "g3")}");
        }

        Line(output, "final state", Numbers.Assignments(model.Variables, result.FinalState));
        if (report.Attractors.Sum(a => a.Starts) > 1)
        {
            WriteAttractors(output, report);
        }

        output.WriteLine();
        var heading = model.Kind == ModelKind.Map ? "fixed points" : "equilibria";
        output.WriteLine(report.FixedPoints.Count == 0 ? $"{heading}: none found" : $"{heading}: {report.FixedPoints.Count}");
        foreach (var point in report.FixedPoints)
        {
            var eigenvalues = string.Join(", ", point.Eigenvalues.Select(Numbers.Format));
            output.WriteLine($"  {Numbers.Assignments(model.Variables, point.State)}");
            output.WriteLine($"      {FixedPointClassifier.Describe(point.Kind, model.Kind)}; eigenvalues {eigenvalues}");
        }
    }

    /// <summary>With several starts: one line per distinct outcome, largest basin first (the one reported above).</summary>
    private static void WriteAttractors(TextWriter output, ProbeReport report)
    {
        var starts = report.Attractors.Sum(a => a.Starts);
        output.WriteLine();
        output.WriteLine($"from {starts} starts: {report.Attractors.Count} distinct outcome{(report.Attractors.Count == 1 ? "" : "s")}");
        foreach (var attractor in report.Attractors)
        {
            var result = attractor.Result;
            var period = result.Period > 0 ? $" (period {result.Period})" : "";
            var exponent = result.Lyapunov.Length > 0 ? $"; λ1 = {Numbers.Format(result.Lyapunov[0])}" : "";
            output.WriteLine($"  #{attractor.Id}  {result.Regime.ToText()}{period}: {attractor.Starts} of {starts} starts ({Numbers.Format(attractor.BasinFraction, "P1")}){exponent}");
            output.WriteLine($"      at {Numbers.Assignments(report.Model.Variables, attractor.Signature.State)}");
        }
    }

    private static string PeriodText(ProbeReport report)
    {
        var result = report.Result;
        if (result.Period == 0)
        {
            return "none found";
        }

        var plural = result.Period == 1 ? "" : "s";
        if (report.Model.Kind == ModelKind.Map)
        {
            return $"{result.Period} iteration{plural}";
        }

        var unit = report.Model.UsesTime ? $"forcing period{plural}" : $"section return{plural}";
        return $"{result.Period} {unit}, T = {Numbers.Format(result.PeriodTime, "g9")}";
    }

    private static void WriteExponents(TextWriter output, PointResult result, ModelKind kind)
    {
        if (result.Lyapunov.Length == 0)
        {
            Line(output, "lyapunov", "not computed");
            return;
        }

        for (var i = 0; i < result.Lyapunov.Length; i++)
        {
            var error = double.IsFinite(result.LyapunovError[i]) ? $"   (±{Numbers.Format(result.LyapunovError[i], "g2")})" : "";
            Line(output, i == 0 ? "lyapunov" : "", $"λ{i + 1} = {Numbers.Format(result.Lyapunov[i])}{error}");
        }

        if (!double.IsNaN(result.LogDetMean))
        {
            var check = kind == ModelKind.Map ? "mean ln|det J|" : "time-averaged div f";
            Line(output, "", $"sum {Numbers.Format(result.Lyapunov.Sum())}; {check} {Numbers.Format(result.LogDetMean)}");
        }
    }

    private static void Line(TextWriter output, string label, string value) =>
        output.WriteLine($"{label.PadRight(Label)}{value}");
}
