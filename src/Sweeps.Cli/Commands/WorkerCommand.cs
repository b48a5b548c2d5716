using System.CommandLine;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Sweeps.Cli.Output;
using Sweeps.Engine.Config;
using Sweeps.Queue;

namespace Sweeps.Cli.Commands;

/// <summary>
/// <c>sweeps worker --queue CONN [--workers N] [--invisibility SECONDS] [--log LEVEL]</c>: serve chunk jobs of any run
/// until stopped. On SIGTERM or Ctrl-C the current chunks are cancelled (they leave no part) and go back
/// to the queue; a worker that dies instead stops heart-beating and its chunks are re-run by another
/// worker once the invisibility timeout has passed. Once every invisibility timeout, a worker also queues again the
/// chunks of the runs it has worked on that were queued but whose jobs were lost (printed as <c>requeued:</c>). What the
/// queue library warns of (a lock it cannot take, the database out of reach) goes to standard error too.
/// </summary>
internal static class WorkerCommand
{
    public static Command Create(CliContext cli)
    {
        var queue = QueueOptions.Create();
        var workers = new Option<int?>("--workers") { Description = "Worker threads (default: the number of cores)" };
        var invisibility = new Option<double?>("--invisibility")
        {
            Description = $"Seconds before a chunk of a worker that died is given to another (default {QueueSettings.DefaultInvisibility.TotalSeconds})",
        };
        var log = new Option<string>("--log")
        {
            Description = "The queue library's messages printed on standard error, from this level up: error, warning (default), info or debug",
            DefaultValueFactory = _ => "warning",
        };
        log.AcceptOnlyFromAmong([.. QueueLog.Levels.Select(l => l.Name)]);
        var command = new Command("worker", "Serve chunk jobs from a shared PostgreSQL queue until stopped");
        command.Options.Add(queue);
        command.Options.Add(workers);
        command.Options.Add(invisibility);
        command.Options.Add(log);
        command.SetAction(async (parse, token) =>
        {
            var connection = QueueOptions.Require(parse, queue);
            var count = SweepSetup.Workers(parse.GetValue(workers));

            var seconds = parse.GetValue(invisibility) ?? QueueSettings.DefaultInvisibility.TotalSeconds;
            if (!(seconds is >= 1 and <= 86400))
            {
                throw ConfigException.Single("--invisibility", $"{seconds} s is out of range (1 to 86400)");
            }

            return await QueueOptions.Guard(connection, async () =>
            {
                var level = QueueLog.Levels.Single(l => l.Name == parse.GetValue(log)).Level;
                var settings = new QueueSettings(count, connection, TimeSpan.FromSeconds(seconds));
                using var host = QueueHost.Build(settings, log: new QueueLog(level, Report));
                var progress = host.Services.GetRequiredService<RunProgress>();
                progress.ChunkFailed += (run, failure) => Report($"failed: {run} {failure}");
                progress.ChunksRequeued += (run, chunks) =>
                    Report($"requeued: {run} chunk{(chunks.Count == 1 ? "" : "s")} {SummaryText.Chunks(chunks)} (queued, but no job of theirs was left waiting or running, or a worker held it unstarted for {settings.StallAfter.TotalSeconds:0} s)");
                await host.StartAsync(CancellationToken.None);
                cli.Output.WriteLine($"worker {Environment.MachineName}:{Environment.ProcessId} serving {ConnectionStrings.Mask(connection)} with {count} thread{(count == 1 ? "" : "s")}");
                cli.Output.Flush();
                try
                {
                    await Task.Delay(Timeout.Infinite, token);
                }
                catch (OperationCanceledException)
                {
                }

                await host.StopAsync(CancellationToken.None);
                cli.Output.WriteLine("worker stopped");
                return ExitCodes.Success;
            });
        });
        return command;

        void Report(string line)
        {
            lock (cli.Error)
            {
                cli.Error.WriteLine(line);
                cli.Error.Flush();
            }
        }
    }
}
