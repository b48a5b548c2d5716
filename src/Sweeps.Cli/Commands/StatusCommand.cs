using System.CommandLine;
using Sweeps.Cli.Output;
using Sweeps.Engine.Runs;

namespace Sweeps.Cli.Commands;

/// <summary><c>sweeps status RUN [--json]</c>: how far a run has got.</summary>
internal static class StatusCommand
{
    public static Command Create(CliContext cli)
    {
        var runArgument = new Argument<string>("RUN") { Description = "A run directory" };
        var json = new Option<bool>("--json") { Description = "Print one JSON object instead of text" };
        var command = new Command("status", "Show the progress of a run: chunks and points done, missing chunks");
        command.Arguments.Add(runArgument);
        command.Options.Add(json);
        command.SetAction(async (parse, token) =>
        {
            var run = RunDirectory.Open(parse.GetRequiredValue(runArgument));
            var summary = await RunSummary.ReadAsync(run, token);
            if (parse.GetValue(json))
            {
                SummaryJson.Write(run, summary, cli.Output, detailed: false);
                return ExitCodes.Success;
            }

            var percent = summary.Points == 0 ? 100 : 100.0 * summary.PointsDone / summary.Points;
            SummaryText.Line(cli.Output, "run", run.FullPath);
            SummaryText.Line(cli.Output, "state", summary.State);
            SummaryText.Line(cli.Output, "chunks", $"{summary.ChunksDone:N0} of {summary.Chunks:N0} done");
            SummaryText.Line(cli.Output, "points", $"{summary.PointsDone:N0} of {summary.Points:N0} ({Numbers.Format(percent, "F1")}%)");
            SummaryText.Line(cli.Output, "missing", SummaryText.Missing(summary));
            return ExitCodes.Success;
        });
        return command;
    }
}
