using Sweeps.Core.Analysis;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Probing;

/// <summary>Analyses one point of a spec and locates the model's fixed points there.</summary>
public static class PointProbe
{
    public static ProbeReport Run(SweepSpec spec, PointOverrides point)
    {
        var model = ModelFactory.Build(spec);
        var analyzer = AnalyzerFactory.Create(spec, model);
        var (attractors, initial) = Attractors(spec, analyzer, point);
        var result = attractors[0].Result;
        if (spec.Starts is { } starts)
        {
            point = point with
            {
                Initial = initial,
                Notes = point.Notes.Append($"{starts.Count} starts from the [starts] box; the orbit shown is start {attractors[0].FirstStart}'s, which reached the largest basin").ToList(),
            };
        }

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
            return new ProbeReport(model, point.Initial, point.Parameters, result, [], notes, attractors);
        }

        var fixedPoints = new FixedPointFinder(model).Find(FixedPointFinder.Starts(seeds, n), point.Parameters);
        return new ProbeReport(model, point.Initial, point.Parameters, result, fixedPoints, point.Notes, attractors);
    }

    /// <summary>The point's attractors: one from its initial state, or one per distinct outcome of its starts (drawn as for grid point 0).</summary>
    private static (IReadOnlyList<Core.Attractors.FoundAttractor> Found, double[] Initial) Attractors(SweepSpec spec, IPointAnalyzer analyzer, PointOverrides point)
    {
        if (spec.Starts is not { } starts)
        {
            return (Core.Attractors.AttractorGrouping.Single(Execution.ChunkRunner.Analyze(analyzer, point.Initial, point.Parameters), spec.Analysis), point.Initial);
        }

        var source = new StartSource(starts, point.Initial.Length);
        source.Fill(0, point.Initial);
        var outcomes = source.States.Select(state => Execution.ChunkRunner.Analyze(analyzer, state, point.Parameters)).ToList();
        var found = Core.Attractors.AttractorGrouping.Group(outcomes, spec.Analysis);
        return (found, source.States[found[0].FirstStart]);
    }
}
