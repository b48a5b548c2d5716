using System.CommandLine;
using Sweeps.Cli.Output;
using Sweeps.Engine.Config;
using Sweeps.Engine.Runs;
using Sweeps.Maps;

namespace Sweeps.Cli.Commands;

/// <summary>
/// <c>sweeps diff RUN_A RUN_B [-o DIR]</c>: what changed from A to B on the same grid. Exit 0 with
/// "no change" when the results are identical, 1 when they differ — so it can gate a model change in CI.
/// </summary>
internal static class DiffCommand
{
    public static Command Create(CliContext cli)
    {
        var first = new Argument<string>("RUN_A") { Description = "The run before" };
        var second = new Argument<string>("RUN_B") { Description = "The run after" };
        var output = new Option<string?>("-o", "--output") { Description = "Folder for changed.parquet and changes.png (default: RUN_B/diff)" };
        var slice = new Option<string[]>("--slice") { Description = "Fix an axis beyond the two drawn (repeatable)" };
        var command = new Command("diff", "Compare two runs of the same grid: regime transitions, changed periods, exponent shifts; exit 1 if anything changed");
        command.Arguments.Add(first);
        command.Arguments.Add(second);
        command.Options.Add(output);
        command.Options.Add(slice);
        command.SetAction(async (parse, token) =>
        {
            var a = RunDirectory.Open(parse.GetRequiredValue(first));
            var b = RunDirectory.Open(parse.GetRequiredValue(second));
            // The picture of the changes is painted as the diff reads the second run, part by part.
            var picture = new DiffRenderer(b.LoadSpec().Grid, MapSlices.Parse(parse.GetValue(slice) ?? []));
            var diff = await RunDiff.CompareAsync(a, b, picture.Add, token);
            var o = cli.Output;
            SummaryText.Line(o, "before", a.FullPath);
            SummaryText.Line(o, "after", b.FullPath);
            SummaryText.Line(o, "specs", diff.SpecChange);
            SummaryText.Line(o, "compared", $"{diff.Compared:N0} points{(diff.OnlyInOne > 0 ? $" ({diff.OnlyInOne:N0} present in only one run)" : "")}");
            if (diff.NoChange)
            {
                SummaryText.Line(o, "result", "no change");
                return ExitCodes.Success;
            }

            SummaryText.Line(o, "regime", $"{diff.RegimeChanged:N0} points changed regime");
            foreach (var ((before, after), count) in diff.Transitions.OrderByDescending(t => t.Value).ThenBy(t => t.Key.Before, StringComparer.Ordinal))
            {
                SummaryText.Line(o, "", $"{before} → {after}: {count:N0}");
            }

            SummaryText.Line(o, "period", $"{diff.PeriodChanged:N0} points kept their regime but changed period");
            SummaryText.Line(o, "λ1", $"{diff.ExponentShifted:N0} points shifted by more than {RunDiff.ExponentTolerance:g1}; largest shift {Numbers.Format(diff.LargestExponentShift)}");
            var folder = parse.GetValue(output) ?? Path.Combine(b.FullPath, "diff");
            Directory.CreateDirectory(folder);
            var axes = b.LoadSpec().Grid.Axes.Select(x => x.Name).ToArray();
            await diff.WriteChangedAsync(Path.Combine(folder, "changed.parquet"), axes, token);
            try
            {
                var png = picture.Render(diff, $"changes: {Path.GetFileName(a.FullPath)} → {Path.GetFileName(b.FullPath)}");
                await File.WriteAllBytesAsync(Path.Combine(folder, "changes.png"), png, token);
            }
            catch (ArgumentException error)
            {
                throw ConfigException.Single(b.FullPath, error.Message);
            }

            SummaryText.Line(o, "written", $"{Path.Combine(folder, "changed.parquet")}, {Path.Combine(folder, "changes.png")}");
            return ExitCodes.Failed;
        });
        return command;
    }
}
