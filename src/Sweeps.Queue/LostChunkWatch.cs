using Hangfire;
using Microsoft.Extensions.Hosting;

namespace Sweeps.Queue;

/// <summary>
/// On a shared queue, once every invisibility timeout: for each run this process has computed chunks of, the missing
/// chunks that were queued but have no job left waiting or running are queued again (<see cref="ChunkQueue.Recover"/>).
/// A job the queue lost would otherwise leave its run unfinished, with every worker idle, until someone submitted the
/// run again. A job that a worker fetched and has held without starting it for <see cref="QueueSettings.StallAfter"/>
/// does not count as waiting: a worker alive but stuck before the job's start keeps the job's queue entry alive, so the
/// job never comes back to the queue. Several hosts may look at once: the submission lock and the liveness test make
/// the later ones find the chunk queued. Failed chunks are left alone (they wait for the run to be submitted again).
/// </summary>
internal sealed class LostChunkWatch(RunContexts contexts, RunProgress progress, JobStorage storage, IBackgroundJobClient client, QueueSettings settings) : BackgroundService
{
    // Per run: the jobs seen held but not started, and since when.
    private readonly Dictionary<string, Dictionary<string, DateTime>> heldSince = new(StringComparer.Ordinal);

    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        using var timer = new PeriodicTimer(settings.Invisibility ?? QueueSettings.DefaultInvisibility);
        try
        {
            while (await timer.WaitForNextTickAsync(stoppingToken))
            {
                foreach (var (queued, context) in contexts.Known)
                {
                    Look(queued, context.Run, DateTime.UtcNow);
                }
            }
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
        }
    }

    private void Look(string queued, Engine.Runs.RunDirectory run, DateTime now)
    {
        try
        {
            var missing = run.MissingChunks();
            if (missing.Count == 0)
            {
                heldSince.Remove(queued);
                return;
            }

            if (ChunkQueue.Recover(storage, client, queued, missing, chunk => !run.IsDone(chunk), Stalled(queued, now)) is { Count: > 0 } recovered)
            {
                progress.Requeued(queued, recovered);
            }
        }
        catch (Exception error) when (error is not OperationCanceledException)
        {
            // The queue out of reach (an outage) or the run directory gone: the next look tries again.
        }
    }

    /// <summary>The run's jobs held unstarted since at least <see cref="QueueSettings.StallAfter"/> ago, as far as these looks saw.</summary>
    private HashSet<string> Stalled(string queued, DateTime now)
    {
        var held = QueueStatus.Held(storage, queued);
        if (!heldSince.TryGetValue(queued, out var since))
        {
            heldSince[queued] = since = new Dictionary<string, DateTime>(StringComparer.Ordinal);
        }

        foreach (var gone in since.Keys.Except(held, StringComparer.Ordinal).ToList())
        {
            since.Remove(gone);
        }

        foreach (var id in held)
        {
            since.TryAdd(id, now);
        }

        return since.Where(j => now - j.Value >= settings.StallAfter).Select(j => j.Key).ToHashSet(StringComparer.Ordinal);
    }
}
