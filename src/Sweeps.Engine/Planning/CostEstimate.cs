using System.Diagnostics;
using Sweeps.Core.Analysis;
using Sweeps.Engine.Probing;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Planning;

/// <summary>
/// Estimates the compute cost of a sweep by timing the analysis of a few points spread evenly over
/// the grid, after a warm-up, averaging the middle half of the timings (times the analyses per point: starts, or the two directions of a continuation sweep). Cost per point varies across a grid
/// (divergent points stop early, chaotic ones do not), so this is a guide, not a promise.
/// </summary>
public sealed record CostEstimate(int SampledPoints, double SecondsPerPoint, double TotalCpuSeconds)
{
    public static CostEstimate Measure(SweepSpec spec, int samples = 12)
    {
        var model = ModelFactory.Build(spec);
        var analyzer = AnalyzerFactory.Create(spec, model);
        var points = spec.Grid.PointCount;
        var count = (int)Math.Min(samples, points);
        var source = new PointSource(spec);

        // Warm-up: the first analyses run while the JIT is still compiling and optimising.
        for (var i = 0; i < 3; i++)
        {
            source.Fill(0);
            analyzer.Analyze(source.Initial, source.Parameters);
        }

        var times = new double[count];
        for (var i = 0; i < count; i++)
        {
            source.Fill(count == 1 ? 0 : (long)((double)i * (points - 1) / (count - 1)));
            var clock = Stopwatch.StartNew();
            analyzer.Analyze(source.Initial, source.Parameters);
            times[i] = clock.Elapsed.TotalSeconds;
        }

        // The mean of the middle half: robust to a late JIT pause, still sensitive to expensive regions.
        Array.Sort(times);
        var middle = times.Skip(count / 4).Take(Math.Max(1, count - (2 * (count / 4)))).ToArray();
        // Every start of a point is a full analysis, and a continuation sweep analyses each point twice.
        var perPoint = middle.Average() * spec.AnalysesPerPoint;
        return new CostEstimate(count, perPoint, perPoint * points);
    }
}
