using Hangfire;

namespace Sweeps.Queue;

/// <summary>What the shared queue knows of one run: chunks running (and where), queued, failed, and the hosts serving.</summary>
public sealed record QueueStatus(
    IReadOnlyList<(long Chunk, string Server)> Running,
    long Queued,
    IReadOnlyList<(long Chunk, string Reason)> Failed,
    IReadOnlyList<(string Name, int Workers, DateTime? Heartbeat)> Hosts)
{
    public static QueueStatus Read(JobStorage storage, string runDirectory)
    {
        var monitoring = storage.GetMonitoringApi();
        var statistics = monitoring.GetStatistics();
        bool Ours(Hangfire.Common.Job? job) => job?.Args.Count >= 2 && job.Args[0] as string == runDirectory;
        long ChunkOf(Hangfire.Common.Job job) => Convert.ToInt64(job.Args[1], System.Globalization.CultureInfo.InvariantCulture);

        var running = monitoring.ProcessingJobs(0, (int)Math.Min(int.MaxValue, statistics.Processing))
            .Where(j => Ours(j.Value.Job))
            .Select(j => (ChunkOf(j.Value.Job), j.Value.ServerId ?? "?"))
            .ToList();
        var queued = 0L;
        foreach (var queue in monitoring.Queues())
        {
            queued += monitoring.EnqueuedJobs(queue.Name, 0, (int)Math.Min(int.MaxValue, queue.Length)).Count(j => Ours(j.Value.Job));
        }

        var failed = monitoring.FailedJobs(0, (int)Math.Min(int.MaxValue, statistics.Failed))
            .Where(j => Ours(j.Value.Job))
            .Select(j => (ChunkOf(j.Value.Job), j.Value.ExceptionMessage ?? j.Value.Reason ?? "failed"))
            .ToList();
        var hosts = monitoring.Servers().Select(s => (s.Name, s.WorkersCount, s.Heartbeat)).ToList();
        return new QueueStatus(running, queued, failed, hosts);
    }
}
