using Sweeps.Engine.Specs;

namespace Sweeps.Maps;

/// <summary>
/// Where the cells of a grid axis sit on a plot axis: linear axes in their own units, logarithmic axes
/// in decades (labelled log10), listed values evenly by index with the values as tick labels.
/// </summary>
internal sealed record AxisScale(GridAxis Axis)
{
    public string Label => Axis.Values is null && Axis.Spacing == AxisSpacing.Log ? $"log10 {Axis.Name}" : Axis.Name;

    public double Position(long index) => Axis.Values is not null
        ? index
        : Axis.Spacing == AxisSpacing.Log ? Math.Log10(Axis.ValueAt(index)) : Axis.ValueAt(index);

    /// <summary>The plot range covered by the cells: half a cell beyond the first and last value.</summary>
    public (double Low, double High) Range()
    {
        var first = Position(0);
        var last = Position(Axis.Count - 1);
        var half = Axis.Count > 1 ? (last - first) / (Axis.Count - 1) / 2 : 0.5;
        return (first - half, last + half);
    }

    /// <summary>Tick positions and labels for listed values; null when the default numeric ticks serve.</summary>
    public (double[] Positions, string[] Labels)? ManualTicks()
    {
        if (Axis.Values is null)
        {
            return null;
        }

        var step = Math.Max(1, (int)Math.Ceiling(Axis.Count / 10.0));
        var positions = Enumerable.Range(0, (int)Axis.Count).Where(i => i % step == 0).Select(i => (double)i).ToArray();
        return (positions, positions.Select(p => Axis.ValueAt((long)p).ToString("g4", System.Globalization.CultureInfo.InvariantCulture)).ToArray());
    }
}
