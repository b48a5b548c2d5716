using Sweeps.Core.Analysis;
using Sweeps.Core.Models;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Probing;

/// <summary>The right analyzer for a spec's model: maps iterate, flows integrate.</summary>
public static class AnalyzerFactory
{
    public static IPointAnalyzer Create(SweepSpec spec, Model model)
    {
        var analyzer = Create(spec, model, spec.Analysis);
        return spec.Analysis.TransientCheck
            ? new TransientCheckedAnalyzer(analyzer, Create(spec, model, spec.Analysis with { Transient = 2 * spec.Analysis.Transient }))
            : analyzer;
    }

    private static IPointAnalyzer Create(SweepSpec spec, Model model, AnalysisSettings settings) => model.Kind == ModelKind.Map
        ? new MapAnalyzer(model, settings)
        : new FlowAnalyzer(model, settings, spec.Integrator, spec.Section ?? new SectionSettings());
}
