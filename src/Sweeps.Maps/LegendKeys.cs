using ScottPlot;
using Sweeps.Engine.Runs;

namespace Sweeps.Maps;

/// <summary>
/// The legend of a picture of classes, gathered row by row as tables are painted: the regimes, period buckets or
/// attractor labels met (the attractors behind the labels from the last table's catalog, which grows as parts are read).
/// </summary>
internal sealed class LegendKeys(ColorMode mode)
{
    private readonly HashSet<string> regimes = [];
    private readonly HashSet<int> periods = [];
    private readonly HashSet<int> attractors = [];
    private IReadOnlyList<Core.Attractors.AttractorSignature> known = [];

    /// <summary>Notes the legend entries of the table's rows on the plane.</summary>
    public void Note(RunTable table, IReadOnlyList<int> rows)
    {
        if (mode == ColorMode.Attractor)
        {
            var labels = table.Attractors ?? throw new InvalidOperationException("attractor labels were not read");
            foreach (var row in rows)
            {
                attractors.Add(MapRenderer.AttractorBucket(labels.Label[row]));
            }

            known = labels.Known;
            return;
        }

        foreach (var row in rows)
        {
            regimes.Add(table.Regime[row]);
            periods.Add(MapRenderer.PeriodBucket(table.Period[row]));
        }
    }

    public void Show(Plot plot) => MapRenderer.ShowLegend(plot, mode switch
    {
        ColorMode.Period => MapRenderer.PeriodLegend(periods),
        ColorMode.Attractor => MapRenderer.AttractorLegend(attractors, known),
        _ => MapRenderer.RegimeLegend(regimes),
    });
}
