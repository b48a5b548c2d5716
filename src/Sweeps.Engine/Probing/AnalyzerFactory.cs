using Sweeps.Core.Analysis;
using Sweeps.Core.Integrators;
using Sweeps.Core.Kernels;
using Sweeps.Core.Models;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Probing;

/// <summary>The right analyzer for a spec's model: maps iterate, flows integrate.</summary>
public static class AnalyzerFactory
{
    /// <summary>
    /// The analyzer for one point. <paramref name="lean"/>: map results without cycle states and window box
    /// (<see cref="MapAnalyzer.Lean"/>) — for chunks whose parts store neither.
    /// </summary>
    public static IPointAnalyzer Create(SweepSpec spec, Model model, bool lean = false)
    {
        var analyzer = Create(spec, model, spec.Analysis, spec.Integrator, lean);
        if (spec.Analysis.TransientCheck)
        {
            var longer = Create(spec, model, spec.Analysis with { Transient = 2 * spec.Analysis.Transient }, spec.Integrator, lean);
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
            analyzer = new CrossCheckedAnalyzer(analyzer, Create(spec, model, spec.Analysis, finer, lean), "step", "half the step");
        }

        return analyzer;
    }

    /// <summary>
    /// The block analyzer for a spec's model, where one applies: one start per point, no cross-checks (they
    /// compare two scalar analyses) and no continuation (each point starts from the previous one's end).
    /// </summary>
    public static IBlockAnalyzer? CreateBlock(SweepSpec spec, Model model, bool lean = false) =>
        spec.Starts is null && !spec.Analysis.TransientCheck && !spec.Analysis.StepCheck && spec.Grid.Follow is null
            ? BlockAnalyzers.Create(model, spec.Analysis, spec.Integrator, spec.Section, lean)
            : null;

    private static IPointAnalyzer Create(SweepSpec spec, Model model, AnalysisSettings settings, IntegratorSettings integrator, bool lean) => model.Kind == ModelKind.Map
        ? new MapAnalyzer(model, settings) { Lean = lean }
        : new FlowAnalyzer(model, settings, integrator, spec.Section ?? new SectionSettings());
}
