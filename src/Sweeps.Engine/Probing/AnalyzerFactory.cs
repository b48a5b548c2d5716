using Sweeps.Core.Analysis;
using Sweeps.Core.Models;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Probing;

/// <summary>The right analyzer for a spec's model: maps iterate, flows integrate.</summary>
public static class AnalyzerFactory
{
    public static IPointAnalyzer Create(SweepSpec spec, Model model) => model.Kind == ModelKind.Map
        ? new MapAnalyzer(model, spec.Analysis)
        : new FlowAnalyzer(model, spec.Analysis, spec.Integrator, spec.Section ?? new SectionSettings());
}
