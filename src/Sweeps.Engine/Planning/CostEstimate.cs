using System.Diagnostics;
using Sweeps.Core.Analysis;
using Sweeps.Engine.Probing;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Planning;

/// <summary>
/// Estimates the compute cost of a sweep by timing the analysis of a few points spread evenly over
/// the grid (the first run of each is discarded as JIT warm-up). Cost per point varies across a grid
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
        var initial = spec.Initial.ToArray();
        var parameters = spec.Parameters.ToArray();
        spec.Grid.Apply(0, initial, parameters);
        analyzer.Analyze(initial, parameters);
        var clock = Stopwatch.StartNew();
        for (var i = 0; i < count; i++)
        {
            var index = count == 1 ? 0 : (long)((double)i * (points - 1) / (count - 1));
            spec.Grid.Apply(index, initial, parameters);
            analyzer.Analyze(initial, parameters);
        }

        var perPoint = clock.Elapsed.TotalSeconds / Math.Max(count, 1);
        return new CostEstimate(count, perPoint, perPoint * points);
    }
}
