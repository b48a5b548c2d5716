using Sweeps.Core.Analysis;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Probing;

/// <summary>Analyses one point of a spec and locates the model's fixed points there.</summary>
public static class PointProbe
{
    public static ProbeReport Run(SweepSpec spec, PointOverrides point)
    {
        var model = ModelFactory.Build(spec);
        var result = AnalyzerFactory.Create(spec, model).Analyze(point.Initial, point.Parameters);
        var n = model.Dimension;
        var seeds = new List<double[]> { point.Initial, result.FinalState };
        seeds.AddRange(result.Cycle);
        for (var i = 0; i + n <= result.Samples.Length; i += n)
        {
            seeds.Add(result.Samples[i..(i + n)]);
        }

        if (model.UsesTime)
        {
            // A forced flow has no equilibria: f changes with t. Its fixed points would be those of the stroboscopic map.
            var notes = point.Notes.Append("a forced flow has no equilibria; its periodic responses are reported as periods of the stroboscopic map").ToList();
            return new ProbeReport(model, point.Initial, point.Parameters, result, [], notes);
        }

        var fixedPoints = new FixedPointFinder(model).Find(FixedPointFinder.Starts(seeds, n), point.Parameters);
        return new ProbeReport(model, point.Initial, point.Parameters, result, fixedPoints, point.Notes);
    }
}
