using System.CommandLine;
using Sweeps.Cli.Output;
using Sweeps.Engine.Runs;

namespace Sweeps.Cli.Commands;

/// <summary><c>sweeps inspect RUN [--json]</c>: what a run holds — counts per regime and period, exponent range, missing chunks.</summary>
internal static class InspectCommand
{
    public static Command Create(CliContext cli)
    {
        var runArgument = new Argument<string>("RUN") { Description = "A run directory" };
        var json = new Option<bool>("--json") { Description = "Print one JSON object instead of text" };
        var command = new Command("inspect", "Summarise a run: points per regime and period, the range of the largest exponent, missing chunks");
        command.Arguments.Add(runArgument);
        command.Options.Add(json);
        command.SetAction(async (parse, token) =>
        {
            var run = RunDirectory.Open(parse.GetRequiredValue(runArgument));
            var summary = await RunSummary.ReadAsync(run, token);
            if (parse.GetValue(json))
            {
                SummaryJson.Write(run, summary, cli.Output, detailed: true);
                return ExitCodes.Success;
            }

            var manifest = run.Manifest;
            SummaryText.Line(cli.Output, "run", run.FullPath);
            SummaryText.Line(cli.Output, "state", $"{summary.State} ({summary.ChunksDone:N0} of {summary.Chunks:N0} chunks)");
            SummaryText.Line(cli.Output, "points", $"{summary.PointsDone:N0} of {summary.Points:N0}");
            SummaryText.Line(cli.Output, "grid", string.Join(" × ", manifest.Shape));
            SummaryText.Line(cli.Output, "provenance", $"spec {manifest.SpecHash[..12]}, model {manifest.ModelHash[..12]}, Sweeps {manifest.ProgramVersion}");
            SummaryText.Line(cli.Output, "regimes", SummaryText.Regimes(summary));
            SummaryText.Line(cli.Output, "periods", SummaryText.Periods(summary));
            SummaryText.Multistability(cli.Output, summary);
            SummaryText.Line(cli.Output, "λ1 range", SummaryText.Range(summary));
            SummaryText.Line(cli.Output, "missing", SummaryText.Missing(summary));
            return ExitCodes.Success;
        });
        return command;
    }
}
