namespace Sweeps.Engine.Planning;

/// <summary>
/// How a grid is cut into chunks (one queue job each). A chunk aims at about
/// <see cref="TargetSeconds"/> of compute, so that a queue's per-job overhead (tens of µs embedded,
/// ~5 ms on PostgreSQL) stays well under 1% while chunks stay small enough to balance uneven points.
/// </summary>
public sealed record ChunkPlan(long Points, long ChunkSize)
{
    public const double TargetSeconds = 2.0;
    public const long MinChunk = 64;
    public const long MaxChunk = 1_000_000;

    public long ChunkCount => (Points + ChunkSize - 1) / ChunkSize;

    public static ChunkPlan For(long points, double secondsPerPoint)
    {
        var size = secondsPerPoint > 0 ? (long)Math.Clamp(TargetSeconds / secondsPerPoint, MinChunk, MaxChunk) : MaxChunk;
        return new ChunkPlan(points, Math.Min(size, Math.Max(points, 1)));
    }
}
