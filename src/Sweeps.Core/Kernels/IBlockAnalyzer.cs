using Sweeps.Core.Analysis;

namespace Sweeps.Core.Kernels;

/// <summary>
/// Analyses several points at once, side by side in vector lanes, with exactly the results of the scalar
/// analyzer (<see cref="Scalar"/>) for each of them. One per thread.
/// </summary>
public interface IBlockAnalyzer
{
    /// <summary>Points per block.</summary>
    int BlockSize { get; }

    /// <summary>The scalar analyzer with the same model and settings, for single points and as a fallback.</summary>
    IPointAnalyzer Scalar { get; }

    /// <summary>
    /// Analyses <paramref name="count"/> ≤ <see cref="BlockSize"/> points: <paramref name="initial"/>[i] and
    /// <paramref name="parameters"/>[i] describe point i; its result goes to <paramref name="results"/>[i].
    /// </summary>
    void Analyze(double[][] initial, double[][] parameters, int count, PointResult[] results);

    /// <summary>
    /// As the method above, each point's outcome handed to <paramref name="rows"/> in order (map analyzers: as fields,
    /// straight from their buffers, wherever they classify a point themselves). If this throws, the points before the
    /// one it failed on have been handed over and no other.
    /// </summary>
    void Analyze(double[][] initial, double[][] parameters, int count, IPointRows rows)
    {
        var results = new PointResult[count];
        Analyze(initial, parameters, count, results);
        for (var i = 0; i < count; i++)
        {
            rows.Add(i, results[i]);
        }
    }
}
