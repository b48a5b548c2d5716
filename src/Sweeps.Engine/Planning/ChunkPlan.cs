namespace Sweeps.Engine.Planning;

/// <summary>
/// How a grid is cut into chunks (one queue job and one part file each). A chunk aims at about
/// <see cref="TargetSeconds"/> of compute, and there are at least <see cref="ChunksPerWorker"/> chunks
/// per worker so that uneven points balance out; but a chunk never drops below a minimum of compute that keeps the
/// cost of a job — the queue's bookkeeping and the part file, about 3 ms on the embedded queue (measured: a 2000-point
/// flow sweep in 32 chunks took 70 ms longer than in 8) and more on PostgreSQL — a few per cent of the work:
/// <see cref="EmbeddedMinSeconds"/> for <c>run</c>, whose short sweeps need the smaller chunks to keep both workers
/// busy to the end, <see cref="MinSeconds"/> for a shared queue. A chunk also holds at most <see cref="MaxChunk"/> points (a chunk's part
/// is written a row group at a time as it is computed, so the cap bounds the part files rather than memory).
/// Where points are analysed in blocks (lanes), a chunk holds whole blocks below the cap, so that no block but the
/// grid's last runs with idle lanes.
/// </summary>
public sealed record ChunkPlan(long Points, long ChunkSize)
{
    public const double TargetSeconds = 2.0;
    /// <summary>The least compute a chunk gets on a shared (PostgreSQL) queue.</summary>
    public const double MinSeconds = 0.25;

    /// <summary>The least compute a chunk gets on the embedded queue of <c>run</c>.</summary>
    public const double EmbeddedMinSeconds = 0.1;
    public const int ChunksPerWorker = 4;
    public const long MaxChunk = 125_000;

    public long ChunkCount => (Points + ChunkSize - 1) / ChunkSize;

    public static ChunkPlan For(long points, double secondsPerPoint, int workers, int block = 1, double minSeconds = MinSeconds)
    {
        var perPoint = Math.Max(secondsPerPoint, 1e-9);
        var balanced = (points + (ChunksPerWorker * workers) - 1) / (ChunksPerWorker * workers);
        var size = Math.Min((long)(TargetSeconds / perPoint), balanced);
        size = Math.Max(size, (long)Math.Ceiling(minSeconds / perPoint));
        size = Math.Clamp(size, 1, MaxChunk);
        if (block > 1)
        {
            // Whole blocks, up to the next multiple; at the cap a chunk stays as it is (rounding down would add a chunk of
            // a few points, and one part-filled block in thousands costs nothing).
            var whole = (size + block - 1) / block * block;
            size = whole <= MaxChunk ? whole : size;
        }

        return new ChunkPlan(points, Math.Min(size, Math.Max(points, 1)));
    }

    /// <summary>
    /// The plan for a spec: its [output] chunk_size if given, else one planned from the cost per point (in whole blocks of
    /// <paramref name="block"/> points, the block analyzer's, and of at least <paramref name="minSeconds"/>); for a
    /// continuation sweep rounded up to whole lines along the followed axis (a line is computed in order).
    /// </summary>
    public static ChunkPlan Of(Specs.SweepSpec spec, double secondsPerPoint, int workers, int block = 1, double minSeconds = MinSeconds)
    {
        var points = spec.Grid.PointCount;
        var plan = spec.ChunkSize is { } size ? Fixed(points, size) : For(points, secondsPerPoint, workers, block, minSeconds);
        var line = spec.Grid.LineLength;
        return line == 1 ? plan : plan with { ChunkSize = Math.Min((plan.ChunkSize + line - 1) / line * line, points) };
    }

    /// <summary>A plan with the chunk size fixed by the config.</summary>
    public static ChunkPlan Fixed(long points, long chunkSize) => new(points, Math.Min(chunkSize, Math.Max(points, 1)));
}
