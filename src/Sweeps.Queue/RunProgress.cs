using System.Collections.Concurrent;

namespace Sweeps.Queue;

/// <summary>Counters of the chunks and points this process has computed, per run directory; thread-safe.</summary>
public sealed class RunProgress
{
    private readonly ConcurrentDictionary<string, Counters> runs = new(StringComparer.Ordinal);

    public Counters For(string runDirectory) => runs.GetOrAdd(Path.TrimEndingDirectorySeparator(Path.GetFullPath(runDirectory)), _ => new Counters());

    public sealed class Counters
    {
        private long points;
        private long chunksDone;
        private long chunksFailed;

        public long Points => Interlocked.Read(ref points);

        public long ChunksDone => Interlocked.Read(ref chunksDone);

        public long ChunksFailed => Interlocked.Read(ref chunksFailed);

        public ConcurrentQueue<string> Failures { get; } = new();

        public void AddPoints(long count) => Interlocked.Add(ref points, count);

        public void ChunkDone() => Interlocked.Increment(ref chunksDone);

        public void ChunkFailed(long chunk, string message)
        {
            Failures.Enqueue($"chunk {chunk}: {message}");
            Interlocked.Increment(ref chunksFailed);
        }
    }
}
