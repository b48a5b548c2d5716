namespace Sweeps.Core.Analysis;

/// <summary>
/// Where a block analyzer puts its points' outcomes, one call per point in order: either a whole
/// <see cref="PointResult"/> or, for the points it classifies itself, the fields a part keeps — written straight into
/// a chunk's columns, so that a block of cheap points leaves no objects behind (a map sweep of a million points made
/// 140 collections of the youngest generation with results alone; docs/performance.md, tenth session).
/// </summary>
public interface IPointRows
{
    /// <summary>The outcome of the block's point <paramref name="lane"/> as a whole result.</summary>
    void Add(int lane, PointResult result);

    /// <summary>
    /// The outcome of the block's point <paramref name="lane"/>, field by field, as in <see cref="PointResult"/> (a map's:
    /// no cycle duration or indicators). The spans are the analyzer's own buffers, valid during the call only.
    /// </summary>
    void Add(int lane, Regime regime, int period, ReadOnlySpan<double> lyapunov, ReadOnlySpan<double> lyapunovError, ReadOnlySpan<double> finalState, string? reason, ReadOnlySpan<double> samples);
}
