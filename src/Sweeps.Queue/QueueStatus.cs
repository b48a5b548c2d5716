using Hangfire;
using Hangfire.States;

namespace Sweeps.Queue;

/// <summary>
/// What the shared queue knows of one run: chunks running (and where), queued, failed, the hosts serving, and the
/// chunks some job will still compute (<see cref="LiveChunks"/>).
/// </summary>
public sealed record QueueStatus(
    IReadOnlyList<(long Chunk, string Server)> Running,
    long Queued,
    IReadOnlyList<(long Chunk, string Reason)> Failed,
    IReadOnlyList<(string Name, int Workers, DateTime? Heartbeat)> Hosts,
    IReadOnlySet<long> Live)
{
    public static QueueStatus Read(JobStorage storage, string runDirectory)
    {
        var monitoring = storage.GetMonitoringApi();
        var jobs = Jobs(monitoring, runDirectory).ToList();
        var running = jobs.Where(j => j.Server is not null).Select(j => (j.Chunk, j.Server!)).ToList();
        var queued = jobs.LongCount(j => j.Waiting && Pending(j.State));
        var failed = monitoring.FailedJobs(0, (int)Math.Min(int.MaxValue, monitoring.GetStatistics().Failed))
            .Where(j => Ours(j.Value.Job, runDirectory))
            .Select(j => (ChunkOf(j.Value.Job), j.Value.ExceptionMessage ?? j.Value.Reason ?? "failed"))
            .ToList();
        var hosts = monitoring.Servers().Select(s => (s.Name, s.WorkersCount, s.Heartbeat)).ToList();
        return new QueueStatus(running, queued, failed, hosts, LiveOf(storage, jobs));
    }

    /// <summary>Of <paramref name="missing"/> chunks, those no job will compute (never queued, failed, or lost).</summary>
    public IReadOnlyList<long> Unqueued(IReadOnlyList<long> missing) => missing.Where(chunk => !Live.Contains(chunk)).ToList();

    /// <summary>
    /// The run's chunks that a job will still compute: a job of the chunk waiting in a queue or fetched from one (a
    /// worker holds it; if the worker dies, the job comes back after the invisibility timeout), in the enqueued or
    /// processing state. On PostgreSQL a job keeps its queue entry until it is done, so a job processing without one
    /// will never finish (its worker gave it up); the in-memory queue takes a job out as a worker fetches it, so there
    /// a job processing on a server that is still alive is live too. A job the queue dropped, a deleted one and a
    /// finished one (whose part was removed since) are not live: their chunks are missing for good unless queued again.
    /// The listings are read in that order, so that a job moving on between two of them is seen in the later one.
    /// </summary>
    /// <param name="stalled">Jobs not to count even so: those a worker fetched and has held for long without starting
    /// them (<see cref="Held"/>).</param>
    public static HashSet<long> LiveChunks(JobStorage storage, string runDirectory, IReadOnlySet<string>? stalled = null) =>
        LiveOf(storage, Jobs(storage.GetMonitoringApi(), runDirectory).Where(j => stalled?.Contains(j.Id) != true));

    /// <summary>
    /// The run's jobs that a worker has fetched from the shared queue but not started: still in the enqueued state with
    /// their queue entry taken. A worker holds a job so for a moment before it starts it — or for as long as it waits
    /// for a lock a dead worker left (the distributed-lock timeout) — and a worker alive but stuck keeps its hold for
    /// ever, so that the job never comes back to the queue.
    /// </summary>
    public static IReadOnlyList<string> Held(JobStorage storage, string runDirectory)
    {
        // The fetched listings alone: a run's waiting jobs may be many, its held ones are at most one per worker.
        var monitoring = storage.GetMonitoringApi();
        return Queues(monitoring)
            .SelectMany(queue => Fetched(monitoring, queue, runDirectory))
            .Where(j => string.Equals(j.State, EnqueuedState.StateName, StringComparison.OrdinalIgnoreCase))
            .Select(j => j.Id)
            .ToList();
    }

    private static HashSet<long> LiveOf(JobStorage storage, IEnumerable<(string Id, long Chunk, string? State, string? Server, bool Waiting)> jobs)
    {
        HashSet<string>? alive = storage is Hangfire.InMemory.InMemoryStorage
            ? storage.GetMonitoringApi().Servers().Select(s => s.Name).ToHashSet(StringComparer.Ordinal)
            : null;
        return jobs
            .Where(j => j.Server is null ? Pending(j.State) : alive?.Contains(j.Server) == true)
            .Select(j => j.Chunk)
            .ToHashSet();
    }

    /// <summary>
    /// The run's jobs the queue lists: those in a queue (waiting, or fetched by a worker; <c>Server</c> null) and those
    /// processing (with their server), in that order; a job can be listed twice.
    /// </summary>
    internal static IEnumerable<(string Id, long Chunk, string? State, string? Server, bool Waiting)> Jobs(Hangfire.Storage.IMonitoringApi monitoring, string runDirectory)
    {
        foreach (var queue in Queues(monitoring))
        {
            var waiting = monitoring.EnqueuedCount(queue);
            IEnumerable<KeyValuePair<string, Hangfire.Storage.Monitoring.EnqueuedJobDto>> listed = waiting > 0 ? monitoring.EnqueuedJobs(queue, 0, (int)Math.Min(int.MaxValue, waiting)) : [];
            foreach (var (id, job) in listed)
            {
                if (Ours(job.Job, runDirectory))
                {
                    yield return (id, ChunkOf(job.Job), job.State, null, true);
                }
            }

            foreach (var (id, chunk, state) in Fetched(monitoring, queue, runDirectory))
            {
                yield return (id, chunk, state, null, false);
            }
        }

        foreach (var (id, job) in monitoring.ProcessingJobs(0, (int)Math.Min(int.MaxValue, monitoring.GetStatistics().Processing)))
        {
            if (Ours(job.Job, runDirectory))
            {
                yield return (id, ChunkOf(job.Job), ProcessingState.StateName, job.ServerId ?? "?", false);
            }
        }
    }

    /// <summary>The run's jobs in <paramref name="queue"/> that a worker has fetched (started or not).</summary>
    private static IEnumerable<(string Id, long Chunk, string? State)> Fetched(Hangfire.Storage.IMonitoringApi monitoring, string queue, string runDirectory)
    {
        var fetched = monitoring.FetchedCount(queue);
        IEnumerable<KeyValuePair<string, Hangfire.Storage.Monitoring.FetchedJobDto>> listed = fetched > 0 ? monitoring.FetchedJobs(queue, 0, (int)Math.Min(int.MaxValue, fetched)) : [];
        return listed.Where(j => Ours(j.Value.Job, runDirectory)).Select(j => (j.Key, ChunkOf(j.Value.Job), (string?)j.Value.State));
    }

    /// <summary>The queues to look at: the default queue, where chunk jobs go, whatever the storage lists, and those it lists.</summary>
    private static IEnumerable<string> Queues(Hangfire.Storage.IMonitoringApi monitoring) =>
        monitoring.Queues().Select(q => q.Name).Append(EnqueuedState.DefaultQueue).Distinct(StringComparer.Ordinal);

    /// <summary>Whether a job in this state will still be performed (or is being performed).</summary>
    internal static bool Pending(string? state) =>
        string.Equals(state, EnqueuedState.StateName, StringComparison.OrdinalIgnoreCase) || string.Equals(state, ProcessingState.StateName, StringComparison.OrdinalIgnoreCase);

    private static bool Ours(Hangfire.Common.Job? job, string runDirectory) => job?.Args.Count >= 2 && job.Args[0] as string == runDirectory;

    private static long ChunkOf(Hangfire.Common.Job job) => Convert.ToInt64(job.Args[1], System.Globalization.CultureInfo.InvariantCulture);
}
