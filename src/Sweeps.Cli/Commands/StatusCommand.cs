using System.CommandLine;
using Sweeps.Cli.Output;
using Sweeps.Engine.Runs;
using Sweeps.Queue;

namespace Sweeps.Cli.Commands;

/// <summary>
/// <c>sweeps status RUN [--json] [--queue CONN]</c>: how far a run has got, from its part files; with a
/// queue, also which chunks are running where, queued or failed, and which hosts are serving.
/// </summary>
internal static class StatusCommand
{
    private static readonly TimeSpan RateWindow = TimeSpan.FromMinutes(5);

    public static Command Create(CliContext cli)
    {
        var runArgument = new Argument<string>("RUN") { Description = "A run directory" };
        var json = new Option<bool>("--json") { Description = "Print one JSON object instead of text" };
        var queue = QueueOptions.Create();
        var command = new Command("status", "Show the progress of a run: chunks and points done, rate and ETA, and for a shared queue the hosts at work");
        command.Arguments.Add(runArgument);
        command.Options.Add(json);
        command.Options.Add(queue);
        command.SetAction(async (parse, token) =>
        {
            var run = RunDirectory.Open(parse.GetRequiredValue(runArgument));
            var summary = await RunSummary.ReadAsync(run, token);
            var (rate, eta) = Rate(run, summary, cli.Clock.GetUtcNow());
            QueueStatus? queued = null;
            if (QueueOptions.Resolve(parse, queue) is { } connection)
            {
                queued = await QueueOptions.Use(connection, (storage, _) => QueueStatus.Read(storage, run.FullPath));
            }

            if (parse.GetValue(json))
            {
                SummaryJson.Write(run, summary, cli.Output, detailed: false, rate, queued);
                return ExitCodes.Success;
            }

            var percent = summary.Points == 0 ? 100 : 100.0 * summary.PointsDone / summary.Points;
            SummaryText.Line(cli.Output, "run", run.FullPath);
            SummaryText.Line(cli.Output, "state", summary.State);
            SummaryText.Line(cli.Output, "chunks", $"{summary.ChunksDone:N0} of {summary.Chunks:N0} done");
            SummaryText.Line(cli.Output, "points", $"{summary.PointsDone:N0} of {summary.Points:N0} ({Numbers.Format(percent, "F1")}%)");
            if (rate > 0 && summary.MissingChunks.Count > 0)
            {
                SummaryText.Line(cli.Output, "rate", $"{rate:N0} points/s over the last parts; ETA {eta}");
            }

            SummaryText.Line(cli.Output, "missing", SummaryText.Missing(summary));
            if (queued is not null)
            {
                SummaryText.Line(cli.Output, "running", queued.Running.Count == 0 ? "none" : string.Join(", ", queued.Running.Select(r => $"{r.Chunk} on {r.Server}")));
                SummaryText.Line(cli.Output, "queued", $"{queued.Queued:N0}");
                SummaryText.Line(cli.Output, "failed", queued.Failed.Count == 0 ? "none" : string.Join("; ", queued.Failed.Select(f => $"{f.Chunk}: {f.Reason}")));
                var unqueued = queued.Unqueued(summary.MissingChunks);
                if (unqueued.Count > 0)
                {
                    SummaryText.Line(cli.Output, "no job", $"{SummaryText.Chunks(unqueued)}: missing, and no job of theirs is waiting or running; submit the run again to queue them");
                }

                foreach (var (name, workers, heartbeat) in queued.Hosts)
                {
                    SummaryText.Line(cli.Output, "host", $"{name} ({workers} workers, heartbeat {heartbeat:u})");
                }
            }

            return ExitCodes.Success;
        });
        return command;
    }

    /// <summary>Points per second from the part files finished in the last few minutes, and the ETA at that rate.</summary>
    private static (double Rate, string Eta) Rate(RunDirectory run, RunSummary summary, DateTimeOffset now)
    {
        var recent = Directory.EnumerateFiles(run.PartsPath, "part-*.parquet")
            .Select(f => File.GetLastWriteTimeUtc(f))
            .Where(t => now.UtcDateTime - t <= RateWindow)
            .Order()
            .ToList();
        if (recent.Count < 2)
        {
            return (0, "–");
        }

        var seconds = (recent[^1] - recent[0]).TotalSeconds;
        var points = (recent.Count - 1) * run.Manifest.ChunkSize;
        if (seconds <= 0)
        {
            return (0, "–");
        }

        var rate = points / seconds;
        var remaining = summary.Points - summary.PointsDone;
        return (rate, TimeSpan.FromSeconds(Math.Round(remaining / rate)).ToString(@"h\:mm\:ss", System.Globalization.CultureInfo.InvariantCulture));
    }
}
