using System.CommandLine;
using System.Diagnostics;
using Sweeps.Cli.Output;
using Sweeps.Engine.Config;
using Sweeps.Engine.Refinement;
using Sweeps.Engine.Runs;

namespace Sweeps.Cli.Commands;

/// <summary>
/// <c>sweeps refine RUN [--levels K] [--workers N]</c>: adds points where neighbouring points disagree in
/// regime or period, halving the spacing there level by level, as extra part files under RUN/levels/.
/// Reports what each level added and what share of a uniform grid at the finest spacing was computed.
/// </summary>
internal static class RefineCommand
{
    public const int MaxLevels = 12;

    public static Command Create(CliContext cli)
    {
        var runArgument = new Argument<string>("RUN") { Description = "A finished run directory" };
        var levels = new Option<int>("--levels") { Description = $"How many times to halve the spacing at boundaries (1 to {MaxLevels})", DefaultValueFactory = _ => 3 };
        var workers = new Option<int?>("--workers") { Description = "Worker threads (default: the number of cores)" };
        var command = new Command("refine", "Add points where neighbouring points disagree in regime or period, halving the spacing there level by level");
        command.Arguments.Add(runArgument);
        command.Options.Add(levels);
        command.Options.Add(workers);
        command.SetAction(async (parse, token) =>
        {
            var run = RunDirectory.Open(parse.GetRequiredValue(runArgument));
            var count = parse.GetValue(levels);
            if (count is < 1 or > MaxLevels)
            {
                throw ConfigException.Single("--levels", $"{count} is out of range (1 to {MaxLevels})");
            }

            var output = cli.Output;
            var clock = Stopwatch.StartNew();
            SummaryText.Line(output, "run", run.FullPath);
            var reports = await Refiner.RunAsync(run, count, SweepSetup.Workers(parse.GetValue(workers)), null, token);
            foreach (var report in reports)
            {
                var note = report.Reused ? " (already computed)" : "";
                SummaryText.Line(output, $"level {report.Level}", $"{report.Points:N0} points at 1/{1L << report.Level} of the grid spacing{note}");
            }

            var spec = run.LoadSpec();
            var deepest = reports.Where(r => r.Points > 0).Select(r => r.Level).DefaultIfEmpty(0).Max();
            var added = reports.Sum(r => r.Points);
            var computed = run.Manifest.Points + added;
            var full = LevelGrid.At(spec.Grid, deepest).PointCount;
            SummaryText.Line(output, "added", $"{added:N0} points in {Numbers.Format(clock.Elapsed.TotalSeconds, "g3")} s");
            SummaryText.Line(output, "saved", deepest == 0
                ? "nothing to refine: no neighbouring points disagree"
                : $"{computed:N0} points computed where a uniform grid at the finest spacing has {full:N0} ({Numbers.Format(100.0 * computed / full, "g3")} %)");
            return ExitCodes.Success;
        });
        return command;
    }
}
