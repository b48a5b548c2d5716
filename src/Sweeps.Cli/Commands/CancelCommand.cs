using System.CommandLine;
using Sweeps.Cli.Output;
using Sweeps.Engine.Runs;
using Sweeps.Queue;

namespace Sweeps.Cli.Commands;

/// <summary>
/// <c>sweeps cancel RUN --queue CONN</c>: withdraw a run from a shared queue. Its waiting and running jobs are deleted
/// (running chunks stop within seconds and leave no part) and the queue forgets its chunks, so that no worker queues
/// them again; the parts already written stay, and submitting the run again resumes it.
/// </summary>
internal static class CancelCommand
{
    public static Command Create(CliContext cli)
    {
        var runArgument = new Argument<string>("RUN") { Description = "A run directory submitted to the queue" };
        var queue = QueueOptions.Create();
        var command = new Command("cancel", "Withdraw a run from a shared PostgreSQL queue (its parts stay; submit it again to resume)");
        command.Arguments.Add(runArgument);
        command.Options.Add(queue);
        command.SetAction(async (parse, token) =>
        {
            var connection = QueueOptions.Require(parse, queue);
            var run = RunDirectory.Open(parse.GetRequiredValue(runArgument));
            var (waiting, running) = await QueueOptions.Use(connection, (storage, client) => ChunkQueue.Withdraw(storage, client, run.FullPath));
            var missing = run.MissingChunks().Count;
            SummaryText.Line(cli.Output, "run", run.FullPath);
            SummaryText.Line(cli.Output, "cancelled", $"{waiting:N0} waiting job{(waiting == 1 ? "" : "s")} deleted, {running:N0} running job{(running == 1 ? "" : "s")} told to stop");
            SummaryText.Line(cli.Output, "chunks", $"{run.Manifest.ChunkCount - missing:N0} of {run.Manifest.ChunkCount:N0} done and kept; submit the run again to resume");
            return ExitCodes.Success;
        });
        return command;
    }
}
