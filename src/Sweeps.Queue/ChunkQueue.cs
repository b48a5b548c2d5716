using Hangfire;
using Hangfire.Common;
using Hangfire.States;
using Hangfire.Storage;

namespace Sweeps.Queue;

/// <summary>
/// Puts the missing chunks of a run on the queue, at most once each: under a distributed lock, the
/// chunks already queued for the run are kept in a Hangfire set, and only chunks neither done nor
/// queued are enqueued. Submitting the same run again, from any host, is therefore safe. A chunk
/// queued before whose job will never run — its part missing and no job of it waiting, fetched or
/// running (a job dropped by the queue, or deleted) — is queued again.
/// </summary>
public static class ChunkQueue
{
    public static string SetKey(string runDirectory) => $"sweeps:queued:{runDirectory}";

    /// <summary>
    /// Enqueues the missing chunks that have no live job (<see cref="QueueStatus.LiveChunks"/>); returns how many were
    /// queued, and how many of those had been queued before.
    /// </summary>
    /// <param name="stillMissing">Whether a chunk's part is still missing, asked again before a chunk that was queued
    /// before is queued again: a job that finished after <paramref name="missing"/> was listed is not live any more,
    /// but its part exists.</param>
    public static SubmitCounts Submit(JobStorage storage, IBackgroundJobClient client, string runDirectory, IReadOnlyList<long> missing, Func<long, bool>? stillMissing = null)
    {
        var (added, again) = Enqueue(storage, client, runDirectory, missing, stillMissing, lostOnly: false);
        return new SubmitCounts(added.Count, again);
    }

    /// <summary>
    /// Enqueues again the missing chunks that were queued before and have no live job left — never a chunk a failure
    /// took off the queue's list (<see cref="Forget"/>: it waits for the run to be submitted again, so that a failure
    /// that would repeat is not retried for ever). Returns the chunks queued.
    /// </summary>
    /// <param name="stalled">Jobs that do not count as live: fetched by a worker that has held them too long without
    /// starting them (<see cref="QueueStatus.Held"/>).</param>
    public static IReadOnlyList<long> Recover(
        JobStorage storage, IBackgroundJobClient client, string runDirectory, IReadOnlyList<long> missing, Func<long, bool> stillMissing, IReadOnlySet<string>? stalled = null) =>
        Enqueue(storage, client, runDirectory, missing, stillMissing, lostOnly: true, stalled).Added;

    private static (List<long> Added, int Again) Enqueue(
        JobStorage storage, IBackgroundJobClient client, string runDirectory, IReadOnlyList<long> missing, Func<long, bool>? stillMissing, bool lostOnly, IReadOnlySet<string>? stalled = null)
    {
        using var connection = storage.GetConnection();
        using var _ = LockRun(connection, runDirectory);
        var queued = connection.GetAllItemsFromSet(SetKey(runDirectory));

        // Read only when a missing chunk was queued before (never in a fresh embedded run): it lists the queue's jobs.
        HashSet<long>? live = null;
        var (added, again) = (new List<long>(), 0);
        foreach (var chunk in missing)
        {
            var item = chunk.ToString(System.Globalization.CultureInfo.InvariantCulture);
            if (queued.Contains(item))
            {
                live ??= QueueStatus.LiveChunks(storage, runDirectory, stalled);
                if (live.Contains(chunk) || stillMissing?.Invoke(chunk) == false)
                {
                    continue;
                }

                again++;
            }
            else if (lostOnly)
            {
                continue;
            }

            client.Create(JobFor(runDirectory, chunk), new EnqueuedState());
            using var transaction = connection.CreateWriteTransaction();
            transaction.AddToSet(SetKey(runDirectory), item);
            transaction.Commit();
            added.Add(chunk);
        }

        return (added, again);
    }

    /// <summary>
    /// Compiles the submission path before there is anything to submit: enqueues a chunk job on a queue no worker
    /// serves (<see cref="WarmUpQueue"/>) and takes the submit lock once. The first job creation of a process costs
    /// about a tenth of a second (serialisation, state handling); the embedded run does this on a spare thread while it
    /// plans, on its in-memory storage, which ends with the process. The job goes the way chunk jobs go (enqueued,
    /// not scheduled and deleted), so that the real submission finds that path ready, and it never runs.
    /// </summary>
    public static void WarmUp(JobStorage storage, IBackgroundJobClient client)
    {
        client.Create(JobFor(string.Empty, -1), new EnqueuedState(WarmUpQueue));
        Submit(storage, client, string.Empty, []);
    }

    /// <summary>The queue of <see cref="WarmUp"/>'s job: Sweeps' workers serve the default queue only.</summary>
    private const string WarmUpQueue = "warm_up";

    /// <summary>
    /// The chunk job, made directly rather than from a lambda: Hangfire would analyse the expression and compile its
    /// argument expressions to get their values, a few milliseconds per job and a tenth of a second for the first. The
    /// cancellation token is a placeholder that Hangfire replaces when it performs the job.
    /// </summary>
    private static Job JobFor(string runDirectory, long chunk) =>
        new(typeof(ChunkJob), RunMethod, runDirectory, chunk, CancellationToken.None);

    private static readonly System.Reflection.MethodInfo RunMethod =
        typeof(ChunkJob).GetMethod(nameof(ChunkJob.RunAsync), [typeof(string), typeof(long), typeof(CancellationToken)])!;

    /// <summary>
    /// Withdraws a run from the queue: its waiting jobs are deleted (a worker that fetches one drops it), its running
    /// ones too (Hangfire cancels a job whose state left processing within seconds: the chunk leaves no part), and the
    /// queue forgets its chunks, so that no worker queues them again. Parts already written stay; submitting the run
    /// again queues what is missing. Returns the jobs deleted: waiting, and running.
    /// </summary>
    public static (int Waiting, int Running) Withdraw(JobStorage storage, IBackgroundJobClient client, string runDirectory)
    {
        using var connection = storage.GetConnection();
        using var held = LockRun(connection, runDirectory);
        var (waiting, running) = (0, 0);
        var seen = new HashSet<string>(StringComparer.Ordinal);
        foreach (var (id, _, state, server, _) in QueueStatus.Jobs(storage.GetMonitoringApi(), runDirectory).ToList())
        {
            if (!QueueStatus.Pending(state) || !seen.Add(id) || !client.Delete(id))
            {
                continue;
            }

            if (server is null && !string.Equals(state, ProcessingState.StateName, StringComparison.OrdinalIgnoreCase))
            {
                waiting++;
            }
            else
            {
                running++;
            }
        }

        var queued = connection.GetAllItemsFromSet(SetKey(runDirectory));
        using var transaction = connection.CreateWriteTransaction();
        foreach (var item in queued)
        {
            transaction.RemoveFromSet(SetKey(runDirectory), item);
        }

        transaction.Commit();
        return (waiting, running);
    }

    /// <summary>The lock under which a run's chunks are queued, queued again or withdrawn, from any host.</summary>
    private static IDisposable LockRun(IStorageConnection connection, string runDirectory) =>
        connection.AcquireDistributedLock($"sweeps:submit:{runDirectory}", TimeSpan.FromSeconds(30));

    /// <summary>What <see cref="Submit"/> did: chunks queued, and how many of those were queued before but had no live job.</summary>
    public readonly record struct SubmitCounts(int Queued, int Requeued);

    /// <summary>Forgets that a chunk is queued (after it failed for good), so that a new submit queues it again.</summary>
    public static void Forget(JobStorage storage, string runDirectory, long chunk)
    {
        using var connection = storage.GetConnection();
        using var transaction = connection.CreateWriteTransaction();
        transaction.RemoveFromSet(SetKey(runDirectory), chunk.ToString(System.Globalization.CultureInfo.InvariantCulture));
        transaction.Commit();
    }
}
