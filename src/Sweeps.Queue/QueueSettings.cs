namespace Sweeps.Queue;

/// <summary>
/// Where the queue lives and how this process serves it. No connection string: the embedded
/// in-memory queue of one process. A PostgreSQL connection string: the shared queue of any number
/// of worker hosts.
/// </summary>
/// <param name="Workers">Worker threads in this process (default: the core count).</param>
/// <param name="Connection">PostgreSQL connection string, or null for the embedded queue.</param>
/// <param name="Invisibility">How long a chunk fetched by a worker that stopped heart-beating stays
/// invisible before another worker takes it (sliding: a live worker keeps extending it).</param>
public sealed record QueueSettings(int Workers, string? Connection = null, TimeSpan? Invisibility = null)
{
    /// <summary>The environment variable a container passes the connection string in.</summary>
    public const string EnvironmentVariable = "SWEEPS_QUEUE";

    public static readonly TimeSpan DefaultInvisibility = TimeSpan.FromSeconds(30);

    public bool Distributed => Connection is not null;

    /// <summary>
    /// How long a worker may hold a job it fetched without starting it before the job's chunk is queued again: four
    /// invisibility timeouts, and at least a minute — well past the longest a live worker waits before it starts a job
    /// (a lock a dead worker left expires after 30 s).
    /// </summary>
    public TimeSpan StallAfter => TimeSpan.FromTicks(Math.Max(4 * (Invisibility ?? DefaultInvisibility).Ticks, TimeSpan.FromMinutes(1).Ticks));
}
