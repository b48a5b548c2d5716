using System.CommandLine;
using Sweeps.Cli.Output;
using Sweeps.Engine.Config;
using Sweeps.Engine.Planning;
using Sweeps.Engine.Runs;
using Sweeps.Engine.Specs;
using Sweeps.Queue;

namespace Sweeps.Cli.Commands;

/// <summary>
/// <c>sweeps submit CONFIG --queue CONN [--out DIR] [--set …]</c>: create the run directory (on storage
/// the workers see at the same path) and queue its missing chunks; prints the run id. Safe to repeat: a chunk is
/// queued again only when no job of it is left waiting or running (one the queue dropped, or deleted).
/// </summary>
internal static class SubmitCommand
{
    public static Command Create(CliContext cli)
    {
        var config = new Argument<string>("CONFIG") { Description = "The sweep config (TOML)" };
        var queue = QueueOptions.Create();
        var outDir = new Option<string?>("--out") { Description = "Run directory, on storage every worker sees at the same path" };
        var set = new Option<string[]>("--set") { Description = "Set a parameter or initial value that is not swept (repeatable)" };
        var command = new Command("submit", "Queue a sweep's chunks on a shared PostgreSQL queue for 'sweeps worker' hosts");
        command.Arguments.Add(config);
        command.Options.Add(queue);
        command.Options.Add(outDir);
        command.Options.Add(set);
        command.SetAction(async (parse, token) =>
        {
            var connection = QueueOptions.Require(parse, queue);
            var setup = SweepSetup.Prepare(parse.GetRequiredValue(config), parse.GetValue(set) ?? [], parse.GetValue(outDir), Environment.ProcessorCount);
            var (run, _) = RunDirectory.CreateOrResume(setup.Directory, setup.Spec, setup.ConfigText, setup.Overrides, setup.ChunkSize, cli.Clock, cleanAbandoned: false);
            var missing = run.MissingChunks();
            var counts = await QueueOptions.Use(connection, (storage, client) => ChunkQueue.Submit(storage, client, run.FullPath, missing, chunk => !run.IsDone(chunk)));
            cli.Output.WriteLine(run.FullPath);
            SummaryText.Line(cli.Error, "run", $"{run.FullPath} (spec {run.Manifest.SpecHash[..12]})");
            SummaryText.Line(cli.Error, "chunks", $"{run.Manifest.ChunkCount:N0}: {run.Manifest.ChunkCount - missing.Count:N0} done, {counts.Queued:N0} queued now, {missing.Count - counts.Queued:N0} already queued");
            if (counts.Requeued > 0)
            {
                SummaryText.Line(cli.Error, "requeued", $"{counts.Requeued:N0} of those queued now had been queued before, but no job of theirs was left waiting or running");
            }

            SummaryText.Line(cli.Error, "queue", ConnectionStrings.Mask(connection));
            return ExitCodes.Success;
        });
        return command;
    }
}
