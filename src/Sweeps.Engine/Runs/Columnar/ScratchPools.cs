using System.Buffers;

namespace Sweeps.Engine.Runs.Columnar;

/// <summary>
/// The writer's scratch arrays: pools of their own, which keep what they are given back. The shared pools release
/// arrays when the collector is under pressure, so a long sweep kept renting fresh megabyte arrays for every part —
/// fresh memory, faulted in page by page (docs/performance.md, eighth session).
/// </summary>
internal static class ScratchPools
{
    /// <summary>Page bodies and compressed pages.</summary>
    public static readonly ArrayPool<byte> Bytes = ArrayPool<byte>.Create(1 << 30, 16);

    /// <summary>Levels and dictionary indices.</summary>
    public static readonly ArrayPool<int> Ints = ArrayPool<int>.Create(1 << 28, 16);
}
