using Sweeps.Core.Analysis;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Probing;

/// <summary>Analyses one point of a spec and locates the model's fixed points there.</summary>
public static class PointProbe
{
    public static ProbeReport Run(SweepSpec spec, PointOverrides point)
    {
        var model = ModelFactory.Build(spec);
        var result = new MapAnalyzer(model, spec.Analysis).Analyze(point.Initial, point.Parameters);
        var n = model.Dimension;
        var seeds = new List<double[]> { point.Initial, result.FinalState };
        seeds.AddRange(result.Cycle);
        for (var i = 0; i + n <= result.Samples.Length; i += n)
        {
            seeds.Add(result.Samples[i..(i + n)]);
        }

        var fixedPoints = new FixedPointFinder(model).Find(FixedPointFinder.Starts(seeds, n), point.Parameters);
        return new ProbeReport(model, point.Initial, point.Parameters, result, fixedPoints, point.Notes);
    }
}
