using Hangfire;
using Sweeps.Engine.Execution;

namespace Sweeps.Queue;

/// <summary>
/// The one Hangfire job: compute chunk <c>chunk</c> of the run in <c>runDirectory</c>. Its arguments
/// are tiny on purpose (Hangfire stores them as JSON); everything else is read from the run directory.
/// Delivery is at least once, which is safe: a chunk whose part exists is skipped, and two runs of the
/// same chunk write identical files.
/// </summary>
public sealed class ChunkJob(RunContexts contexts, RunProgress progress, JobStorage storage)
{
    [AutomaticRetry(Attempts = 0)]
    public async Task RunAsync(string runDirectory, long chunk, CancellationToken cancellationToken)
    {
        var counters = progress.For(runDirectory);
        try
        {
            var context = contexts.Get(runDirectory);
            await ChunkRunner.RunAsync(context, chunk, counters.AddPoints, cancellationToken);
            counters.ChunkDone();
            if (context.Run.CompletedParts() == context.Run.Manifest.ChunkCount)
            {
                // The last part of a run, whoever wrote it, closes the manifest (idempotent).
                context.Run.MarkFinished(TimeProvider.System);
            }
        }
        catch (OperationCanceledException) when (cancellationToken.IsCancellationRequested)
        {
            throw;
        }
        catch (Exception error)
        {
            counters.ChunkFailed(chunk, error.Message);
            ChunkQueue.Forget(storage, runDirectory, chunk);
            throw;
        }
    }
}
