using ScottPlot;
using SkiaSharp;
using Sweeps.Engine.Runs;
using Sweeps.Engine.Specs;

namespace Sweeps.Maps;

/// <summary>
/// A bifurcation diagram built up from tables of rows: first every table's samples widen the value range
/// (<see cref="Measure"/>), then every table adds its samples to the density counts, its classes to the strip and its
/// entries to the legend (<see cref="Add"/>), and <see cref="Draw"/> draws the whole. A run held in memory is one
/// table; a run read part by part is one table per part, and nothing but the counts and the strip stays in memory.
/// </summary>
internal sealed class BifurcationPicture(GridAxis axis, ColorMode mode, bool branches)
{
    private const int DensityRows = 500;

    private readonly int nx = (int)axis.Count;
    private readonly CellRaster classes = new((int)axis.Count, 1);
    private readonly CellRaster? hysteretic = branches ? new((int)axis.Count, 1) : null;
    private readonly ColorMode stripColors = StripColors(mode);
    private readonly LegendKeys legend = new(StripColors(mode));
    private (double Low, double High) range = (double.PositiveInfinity, double.NegativeInfinity);
    private int[,]? counts;
    private int[,]? backCounts;

    private int Columns => Math.Min(nx, 1200);

    /// <summary>The strip's colouring: regimes unless periods or attractors were asked for.</summary>
    private static ColorMode StripColors(ColorMode mode) => mode is ColorMode.Period or ColorMode.Attractor ? mode : ColorMode.Regime;

    /// <summary>Widens the value range to take in the samples of the table's rows on the plane (both branches).</summary>
    public void Measure(RunTable table, MapPlane plane)
    {
        var samples = table.Samples ?? throw new InvalidOperationException("samples were not read");
        foreach (var row in plane.Rows)
        {
            range = Bounds(samples[row], range);
            if (table.BackwardSamples is { } backward)
            {
                range = Bounds(backward[row], range);
            }
        }
    }

    /// <summary>Counts the table's samples into the density, paints its classes into the strip, notes its legend entries.</summary>
    public void Add(RunTable table, MapPlane plane)
    {
        var (low, high) = Range();
        counts ??= new int[DensityRows, Columns];
        Count(plane, table.Samples!, counts, low, high);
        if (table.BackwardSamples is { } backward)
        {
            backCounts ??= new int[DensityRows, Columns];
            Count(plane, backward, backCounts, low, high);
        }

        if (hysteretic is not null && table.Hysteresis is { } hysteresis)
        {
            for (var k = 0; k < plane.Rows.Count; k++)
            {
                if (hysteresis[plane.Rows[k]])
                {
                    hysteretic.Paint((int)plane.Cells[k, 0], 0, Palette.Hysteresis);
                }
            }
        }

        for (var k = 0; k < plane.Rows.Count; k++)
        {
            var color = MapRenderer.CellColor(table, plane.Rows[k], stripColors);
            var (left, right, _, _) = MapRenderer.Cover(plane, k, nx, 1);
            for (var i = left; i <= right; i++)
            {
                classes.Paint(i, 0, color);
            }
        }

        legend.Note(table, plane.Rows);
    }

    /// <summary>The diagram: the density of samples over the axis, the class strip beneath it (and the hysteresis strip).</summary>
    public void Draw(Plot plot, string variable, int columnPixels)
    {
        var x = new AxisScale(axis);
        var (x0, x1) = x.Range();
        var (low, high) = Range();
        var columns = Columns;
        counts ??= new int[DensityRows, columns];
        var densest = Densest(counts);
        var backMost = backCounts is null ? 1 : Densest(backCounts);
        var shades = new SKColor[DensityRows * columns];
        for (var r = 0; r < DensityRows; r++)
        {
            for (var c = 0; c < columns; c++)
            {
                shades[(r * columns) + c] = backCounts is null
                    ? Grey(Shade(counts[r, c], densest))
                    : TwoBranches(Shade(counts[r, c], densest), Shade(backCounts[r, c], backMost));
            }
        }

        using var density = new SKBitmap(columns, DensityRows) { Pixels = shades };
        var densityImage = plot.Add.ImageRect(new Image(density), new CoordinateRect(x0, x1, low, high));
        densityImage.AntiAlias = false;

        // The class strip beneath the diagram (and, for a continuation sweep, the hysteresis strip under it).
        var stripHigh = low - (0.02 * (high - low));
        var stripLow = low - (0.08 * (high - low));
        if (hysteretic is not null)
        {
            var bandLow = stripLow - (0.05 * (high - low));
            using var band = hysteretic.ToBitmap(columnPixels, 1, Palette.Unknown);
            var bandImage = plot.Add.ImageRect(new Image(band), new CoordinateRect(x0, x1, bandLow, stripLow - (0.01 * (high - low))));
            bandImage.AntiAlias = false;
            plot.Legend.ManualItems.Add(new LegendItem { LabelText = "forward sweep", FillColor = Palette.ForwardBranch, LineWidth = 0, MarkerSize = 0 });
            plot.Legend.ManualItems.Add(new LegendItem { LabelText = "backward sweep", FillColor = Palette.BackwardBranch, LineWidth = 0, MarkerSize = 0 });
            plot.Legend.ManualItems.Add(new LegendItem { LabelText = "hysteresis (lower strip)", FillColor = Palette.Hysteresis, LineWidth = 0, MarkerSize = 0 });
            stripLow = bandLow;
        }

        using var strip = classes.ToBitmap(columnPixels, 1, Palette.Unknown);
        var stripImage = plot.Add.ImageRect(new Image(strip), new CoordinateRect(x0, x1, low - (0.08 * (high - low)), stripHigh));
        stripImage.AntiAlias = false;
        legend.Show(plot);
        plot.Axes.SetLimits(x0, x1, stripLow, high);
        MapRenderer.Label(plot, x, $"{variable} (samples; strip: {MapRenderer.Describe(stripColors)})");
    }

    /// <summary>The drawn value range: the samples' range with 3 % on either side (±0.5 around a single value; −1 … 1 without samples).</summary>
    private (double Low, double High) Range()
    {
        var (low, high) = range.Low > range.High ? (-1.0, 1.0) : range;
        if (high - low < 1e-12)
        {
            (low, high) = (low - 0.5, high + 0.5);
        }

        var span = high - low;
        return (low - (0.03 * span), high + (0.03 * span));
    }

    /// <summary>The finite values' range widened to take <paramref name="values"/> in.</summary>
    private static (double Low, double High) Bounds(ReadOnlySpan<double> values, (double Low, double High) range)
    {
        var (low, high) = range;
        foreach (var value in values)
        {
            if (double.IsFinite(value))
            {
                (low, high) = (Math.Min(low, value), Math.Max(high, value));
            }
        }

        return (low, high);
    }

    /// <summary>Density, not overplotted dots: counts samples per cell (shaded later by log(1 + count)).</summary>
    private void Count(MapPlane plane, RowValues samples, int[,] into, double low, double high)
    {
        var columns = Columns;
        for (var k = 0; k < plane.Rows.Count; k++)
        {
            var column = (int)(plane.Cells[k, 0] * columns / nx);
            foreach (var value in samples[plane.Rows[k]])
            {
                if (double.IsFinite(value))
                {
                    var rowIndex = Math.Clamp((int)((high - value) / (high - low) * DensityRows), 0, DensityRows - 1);
                    into[rowIndex, column]++;
                }
            }
        }
    }

    private static int Densest(int[,] cells)
    {
        var most = 1;
        foreach (var count in cells)
        {
            most = Math.Max(most, count);
        }

        return most;
    }

    /// <summary>0 for an empty cell, else 0.25 … 1 by log(1 + count).</summary>
    private static double Shade(int count, int most) => count == 0 ? 0 : 0.25 + (0.75 * Math.Log(1 + count) / Math.Log(1 + most));

    private static SKColor Grey(double shade)
    {
        var level = (byte)(255 - (int)(shade * 235));
        return new SKColor(level, level, (byte)Math.Min(255, level + 12));
    }

    /// <summary>Each branch tints white towards its own colour; where both have samples the tints multiply (darker).</summary>
    private static SKColor TwoBranches(double forward, double backward)
    {
        static double Tint(double shade, byte channel) => 1 - (shade * (1 - (channel / 255.0)));
        var (f, b) = (Palette.ForwardBranch, Palette.BackwardBranch);
        byte Mix(byte fc, byte bc) => (byte)Math.Round(255 * Tint(forward, fc) * Tint(backward, bc));
        return new SKColor(Mix(f.R, b.R), Mix(f.G, b.G), Mix(f.B, b.B));
    }
}
