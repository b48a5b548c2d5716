using Sweeps.Core.Analysis;
using Sweeps.Core.Integrators;
using Sweeps.Core.Models;

namespace Sweeps.Core.Kernels;

/// <summary>Chooses the block analyzer for a model and its settings, where there is one.</summary>
public static class BlockAnalyzers
{
    /// <summary>
    /// A block analyzer for one-variable maps (<see cref="MapBlockAnalyzer"/>), maps of several variables
    /// (<see cref="MapLaneAnalyzer"/>), fixed-step flows (<see cref="FlowBlockAnalyzer"/>) or Dormand–Prince flows
    /// (<see cref="DormandPrinceBlockAnalyzer"/>); null where only the
    /// scalar analyzers apply.
    /// </summary>
    /// <param name="model">The model.</param>
    /// <param name="settings">The analysis settings.</param>
    /// <param name="integrator">The integrator (flows).</param>
    /// <param name="section">The section (flows).</param>
    /// <param name="lean">Map results without cycle states and window box (<see cref="MapAnalyzer.Lean"/>).</param>
    public static IBlockAnalyzer? Create(Model model, AnalysisSettings settings, IntegratorSettings integrator, SectionSettings? section, bool lean = false)
    {
        if (MapBlockAnalyzer.Supports(model, settings))
        {
            return new MapBlockAnalyzer(model, settings, lean);
        }

        if (MapLaneAnalyzer.Supports(model, settings))
        {
            return new MapLaneAnalyzer(model, settings, lean);
        }

        if (DormandPrinceBlockAnalyzer.Supports(model, integrator))
        {
            return new DormandPrinceBlockAnalyzer(model, settings, integrator, section ?? new SectionSettings());
        }

        return FlowBlockAnalyzer.Supports(model, integrator) ? new FlowBlockAnalyzer(model, settings, integrator, section ?? new SectionSettings()) : null;
    }
}
