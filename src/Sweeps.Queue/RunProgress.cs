using System.Collections.Concurrent;

namespace Sweeps.Queue;

/// <summary>Counters of the chunks and points this process has computed, per run directory; thread-safe.</summary>
public sealed class RunProgress
{
    private readonly ConcurrentDictionary<string, Counters> runs = new(StringComparer.Ordinal);

    /// <summary>
    /// Raised on the job's thread when a chunk of any run fails, with the run directory and "chunk N: what went wrong":
    /// a worker, which has no progress display, prints it (a failed chunk is not retried until the run is submitted again).
    /// </summary>
    public event Action<string, string>? ChunkFailed;

    /// <summary>
    /// Raised when this process queued chunks of a run again whose jobs were lost (<see cref="LostChunkWatch"/>), with the
    /// run directory and the chunks: a worker prints it.
    /// </summary>
    public event Action<string, IReadOnlyList<long>>? ChunksRequeued;

    internal void Requeued(string runDirectory, IReadOnlyList<long> chunks) => ChunksRequeued?.Invoke(runDirectory, chunks);

    public Counters For(string runDirectory) =>
        runs.GetOrAdd(Path.TrimEndingDirectorySeparator(Path.GetFullPath(runDirectory)), run => new Counters(failure => ChunkFailed?.Invoke(run, failure)));

    public sealed class Counters(Action<string> report)
    {
        private long points;
        private long chunksDone;
        private long chunksFailed;
        private TaskCompletionSource changed = new(TaskCreationOptions.RunContinuationsAsynchronously);

        public long Points => Interlocked.Read(ref points);

        public long ChunksDone => Interlocked.Read(ref chunksDone);

        public long ChunksFailed => Interlocked.Read(ref chunksFailed);

        public ConcurrentQueue<string> Failures { get; } = new();

        /// <summary>Completes when the next chunk is done or fails: a progress display waits on it instead of polling.</summary>
        public Task NextChunk => Volatile.Read(ref changed).Task;

        public void AddPoints(long count) => Interlocked.Add(ref points, count);

        public void ChunkDone()
        {
            Interlocked.Increment(ref chunksDone);
            Signal();
        }

        public void ChunkFailed(long chunk, string message)
        {
            var failure = $"chunk {chunk}: {message}";
            Failures.Enqueue(failure);
            report(failure);
            Interlocked.Increment(ref chunksFailed);
            Signal();
        }

        private void Signal() =>
            Interlocked.Exchange(ref changed, new TaskCompletionSource(TaskCreationOptions.RunContinuationsAsynchronously)).TrySetResult();
    }
}
