using Sweeps.Core.Analysis;
using Sweeps.Core.Integrators;
using Sweeps.Core.Kernels;
using Sweeps.Core.Models;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Probing;

/// <summary>The right analyzer for a spec's model: maps iterate, flows integrate.</summary>
public static class AnalyzerFactory
{
    public static IPointAnalyzer Create(SweepSpec spec, Model model)
    {
        var analyzer = Create(spec, model, spec.Analysis, spec.Integrator);
        if (spec.Analysis.TransientCheck)
        {
            var longer = Create(spec, model, spec.Analysis with { Transient = 2 * spec.Analysis.Transient }, spec.Integrator);
            analyzer = new CrossCheckedAnalyzer(analyzer, longer, "transient", "twice the transient");
        }

        if (spec.Analysis.StepCheck && model.Kind == ModelKind.Flow)
        {
            // Half the step for fixed-step schemes; a hundredth of the tolerances (about half the step) for Dormand–Prince.
            var finer = spec.Integrator with
            {
                Step = spec.Integrator.Step / 2,
                RelativeTolerance = spec.Integrator.RelativeTolerance / 100,
                AbsoluteTolerance = spec.Integrator.AbsoluteTolerance / 100,
            };
            analyzer = new CrossCheckedAnalyzer(analyzer, Create(spec, model, spec.Analysis, finer), "step", "half the step");
        }

        return analyzer;
    }

    /// <summary>
    /// The block analyzer for a spec's model, where one applies: one start per point, no cross-checks (they
    /// compare two scalar analyses) and no continuation (each point starts from the previous one's end).
    /// </summary>
    public static IBlockAnalyzer? CreateBlock(SweepSpec spec, Model model) =>
        spec.Starts is null && !spec.Analysis.TransientCheck && !spec.Analysis.StepCheck && spec.Grid.Follow is null
            ? BlockAnalyzers.Create(model, spec.Analysis, spec.Integrator, spec.Section)
            : null;

    private static IPointAnalyzer Create(SweepSpec spec, Model model, AnalysisSettings settings, IntegratorSettings integrator) => model.Kind == ModelKind.Map
        ? new MapAnalyzer(model, settings)
        : new FlowAnalyzer(model, settings, integrator, spec.Section ?? new SectionSettings());
}
