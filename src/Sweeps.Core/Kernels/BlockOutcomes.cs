using Sweeps.Core.Analysis;

namespace Sweeps.Core.Kernels;

/// <summary>
/// Where a map block analyzer puts its points' outcomes: an array of whole results, or rows (<see cref="IPointRows"/>),
/// which take the fields of the points the block classifies itself.
/// </summary>
internal readonly struct BlockOutcomes(PointResult[]? results, IPointRows? rows)
{
    /// <summary>Whether the points' outcomes are wanted as whole results (an array) rather than as rows.</summary>
    public bool WholeResults => results is not null;

    /// <summary>The rows (when <see cref="WholeResults"/> is false).</summary>
    public IPointRows Rows => rows!;

    /// <summary>Point <paramref name="lane"/>'s outcome as a whole result.</summary>
    public void Add(int lane, PointResult result)
    {
        if (results is not null)
        {
            results[lane] = result;
        }
        else
        {
            rows!.Add(lane, result);
        }
    }
}
