using ScottPlot;
using Sweeps.Engine.Runs;

namespace Sweeps.Maps;

/// <summary>
/// The legend of a picture of classes, gathered row by row as tables are painted: the regimes and period buckets
/// met, and for attractor colours the one table and rows whose labels name the entries.
/// </summary>
internal sealed class LegendKeys(ColorMode mode)
{
    private readonly HashSet<string> regimes = [];
    private readonly HashSet<int> periods = [];
    private (RunTable Table, IReadOnlyList<int> Rows)? attractorRows;

    /// <summary>Notes the legend entries of the table's rows on the plane.</summary>
    public void Note(RunTable table, IReadOnlyList<int> rows)
    {
        if (mode == ColorMode.Attractor)
        {
            attractorRows = attractorRows is null ? (table, rows) : throw new InvalidOperationException("attractor colours need the whole run in one table");
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
        ColorMode.Attractor => attractorRows is { } rows ? MapRenderer.AttractorLegend(rows.Table, rows.Rows) : [],
        _ => MapRenderer.RegimeLegend(regimes),
    });
}
