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
}
