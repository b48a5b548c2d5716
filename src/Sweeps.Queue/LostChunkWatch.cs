using Hangfire;
using Microsoft.Extensions.Hosting;

namespace Sweeps.Queue;

/// <summary>
/// On a shared queue, once every invisibility timeout: for each run this process has computed chunks of, the missing
/// chunks that were queued but have no job left waiting or running are queued again (<see cref="ChunkQueue.Recover"/>).
/// A job the queue lost would otherwise leave its run unfinished, with every worker idle, until someone submitted the
/// run again. Several hosts may look at once: the submission lock and the liveness test make the later ones find the
/// chunk queued. Failed chunks are left alone (they wait for the run to be submitted again).
/// </summary>
internal sealed class LostChunkWatch(RunContexts contexts, RunProgress progress, JobStorage storage, IBackgroundJobClient client, QueueSettings settings) : BackgroundService
{
    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        using var timer = new PeriodicTimer(settings.Invisibility ?? QueueSettings.DefaultInvisibility);
        try
        {
            while (await timer.WaitForNextTickAsync(stoppingToken))
            {
                foreach (var (queued, context) in contexts.Known)
                {
                    Look(queued, context.Run);
                }
            }
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
        }
    }

    private void Look(string queued, Engine.Runs.RunDirectory run)
    {
        try
        {
            var missing = run.MissingChunks();
            if (missing.Count > 0 && ChunkQueue.Recover(storage, client, queued, missing, chunk => !run.IsDone(chunk)) is { Count: > 0 } recovered)
            {
                progress.Requeued(queued, recovered);
            }
        }
        catch (Exception error) when (error is not OperationCanceledException)
        {
            // The queue out of reach (an outage) or the run directory gone: the next look tries again.
        }
    }
}
