namespace Sweeps.Core.Analysis;

/// <summary>Analyses one point at a time; implementations own their buffers and are not thread-safe.</summary>
public interface IPointAnalyzer
{
    PointResult Analyze(ReadOnlySpan<double> initial, double[] parameters);
}
