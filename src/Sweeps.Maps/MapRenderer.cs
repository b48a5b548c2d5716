using ScottPlot;
using SkiaSharp;
using Sweeps.Engine.Runs;
using Sweeps.Engine.Specs;

namespace Sweeps.Maps;

/// <summary>
/// Draws a run from its directory alone (no re-computation): a regime map, one cell per grid point,
/// for two free axes; a bifurcation diagram — the density of attractor samples over the parameter,
/// with the class as a strip beneath — for one. Returns PNG bytes.
/// </summary>
public static class MapRenderer
{
    private const int DensityRows = 500;

    /// <summary>
    /// The most pixels a picture of cells gets along an axis (more when the image asked for is wider or taller): a
    /// grid beyond it is drawn with several cells to a pixel (<see cref="CellRaster"/>), which loses nothing the image
    /// can show.
    /// </summary>
    internal const int MostPixels = 2048;

    /// <summary>
    /// Whether drawing <paramref name="request"/> reads the attractor samples: only a bifurcation diagram (one axis left
    /// free) does — a regime map of a large run is read without them, a fraction of the memory and time.
    /// </summary>
    public static bool DrawsSamples(Grid grid, MapRequest request) =>
        grid.Axes.Count(a => a.Count > 1 && !request.Slices.ContainsKey(a.Name)) == 1;

    /// <param name="levels">Refinement levels 1, 2, … of the run (their tables), drawn at the finest resolution; not used for attractor colours.</param>
    public static byte[] Render(RunDirectory run, RunTable table, MapRequest request, string title, IReadOnlyList<RunTable>? levels = null) =>
        Build(run, table, request, title, levels).GetImageBytes(request.Width, request.Height, ImageFormat.Png);

    /// <summary>The plot, before rendering (tests render it and ask where data coordinates land in pixels).</summary>
    internal static Plot Build(RunDirectory run, RunTable table, MapRequest request, string title, IReadOnlyList<RunTable>? levels = null)
    {
        FontSetup.EnsureRegistered();
        var grid = run.LoadSpec().Grid;
        MapPlane plane;
        if (levels is { Count: > 0 } && request.Color != ColorMode.Attractor)
        {
            (plane, table) = MapPlane.SelectRefined(grid, [table, .. levels], request.Slices);
        }
        else
        {
            plane = MapPlane.Select(grid, table, request.Slices);
        }

        var plot = new Plot();
        plot.FigureBackground.Color = Colors.White;
        var subtitle = plane.Description.Length > 0 ? $" ({plane.Description})" : "";
        (int Columns, int Rows) pixels = (Math.Max(MostPixels, request.Width), Math.Max(MostPixels, request.Height));
        if (plane.Free.Count == 2)
        {
            DrawPlane(plot, table, plane, request.Color, pixels);
            plot.Title($"{title}: {Describe(request.Color)}{subtitle}");
        }
        else
        {
            DrawBifurcation(plot, table, plane, request.Color, run.LoadSpec().Model.Variables[0], pixels.Columns);
            plot.Title($"{title}: attractor samples{subtitle}");
        }

        return plot;
    }

    /// <summary>Colours of categorical cells, for maps and for the strip of a bifurcation diagram.</summary>
    internal static Color CellColor(RunTable table, int row, ColorMode mode) => mode switch
    {
        ColorMode.Period => Palette.ForPeriod(table.Period[row]),
        ColorMode.Attractor => Palette.ForAttractor(AttractorLabel(table, row)),
        _ => Palette.ForRegime(table.Regime[row]),
    };

    private static int AttractorLabel(RunTable table, int row) =>
        (table.Attractors ?? throw new InvalidOperationException("attractor labels were not read")).Label[row];

    /// <summary>The strip colouring of a bifurcation diagram: regimes unless periods or attractors were asked for.</summary>
    private static ColorMode StripMode(ColorMode mode) => mode is ColorMode.Period or ColorMode.Attractor ? mode : ColorMode.Regime;

    private static void DrawPlane(Plot plot, RunTable table, MapPlane plane, ColorMode mode, (int Columns, int Rows) pixels)
    {
        var (x, y) = (new AxisScale(plane.Free[0]), new AxisScale(plane.Free[1]));
        var (nx, ny) = ((int)plane.Free[0].Count, (int)plane.Free[1].Count);
        var (x0, x1) = x.Range();
        var (y0, y1) = y.Range();
        if (mode == ColorMode.Lyapunov)
        {
            var values = new double[ny, nx];
            for (var i = 0; i < ny; i++)
            {
                for (var j = 0; j < nx; j++)
                {
                    values[i, j] = double.NaN;
                }
            }

            for (var k = 0; k < plane.Rows.Count; k++)
            {
                var value = Clip(table.Lyapunov[plane.Rows[k]]);
                Paint(plane, k, nx, ny, (i, j) => values[ny - 1 - j, i] = value);
            }

            var limit = Limit(table, plane);
            var heatmap = plot.Add.Heatmap(Shrink(values, pixels.Rows, pixels.Columns, limit));
            heatmap.Colormap = Palette.Exponents;
            heatmap.ManualRange = new ScottPlot.Range(-limit, limit);
            heatmap.Extent = new CoordinateRect(x0, x1, y0, y1);
            heatmap.Smooth = false;
            heatmap.NaNCellColor = Palette.NoPeriod;
            var bar = plot.Add.ColorBar(heatmap, Edge.Right);
            bar.Label = "largest Lyapunov exponent";
        }
        else
        {
            var raster = new CellRaster(nx, ny);
            for (var k = 0; k < plane.Rows.Count; k++)
            {
                var color = CellColor(table, plane.Rows[k], mode);
                Paint(plane, k, nx, ny, (i, j) => raster.Paint(i, ny - 1 - j, color));
            }

            using var bitmap = raster.ToBitmap(pixels.Columns, pixels.Rows, Palette.Unknown);
            var image = plot.Add.ImageRect(new Image(bitmap), new CoordinateRect(x0, x1, y0, y1));
            image.AntiAlias = false;
            AddLegend(plot, table, plane.Rows, mode);
        }

        plot.Axes.SetLimits(x0, x1, y0, y1);
        Label(plot, x, y.Label);
        ApplyTicks(plot.Axes.Left, y);
    }

    private static void DrawBifurcation(Plot plot, RunTable table, MapPlane plane, ColorMode mode, string variable, int columnPixels)
    {
        var x = new AxisScale(plane.Free[0]);
        var nx = (int)plane.Free[0].Count;
        var (x0, x1) = x.Range();
        var samples = table.Samples ?? throw new InvalidOperationException("samples were not read");
        var backward = table.BackwardSamples;
        var (low, high) = (double.PositiveInfinity, double.NegativeInfinity);
        foreach (var row in plane.Rows)
        {
            (low, high) = Bounds(samples[row], low, high);
            if (backward is not null)
            {
                (low, high) = Bounds(backward[row], low, high);
            }
        }

        if (low > high)
        {
            (low, high) = (-1.0, 1.0);
        }

        if (high - low < 1e-12)
        {
            (low, high) = (low - 0.5, high + 0.5);
        }

        var span = high - low;
        (low, high) = (low - (0.03 * span), high + (0.03 * span));

        // Density, not overplotted dots: count samples per cell, shade by log(1 + count).
        var columns = Math.Min(nx, 1200);
        var (counts, densest) = Density(plane, samples, columns, nx, low, high);
        var (backCounts, backMost) = backward is null ? (null, 1) : Density(plane, backward, columns, nx, low, high);
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
        if (table.Hysteresis is { } hysteresis)
        {
            var bandLow = stripLow - (0.05 * (high - low));
            var hysteretic = new CellRaster(nx, 1);
            for (var k = 0; k < plane.Rows.Count; k++)
            {
                if (hysteresis[plane.Rows[k]])
                {
                    hysteretic.Paint((int)plane.Cells[k, 0], 0, Palette.Hysteresis);
                }
            }

            using var band = hysteretic.ToBitmap(columnPixels, 1, Palette.Unknown);
            var bandImage = plot.Add.ImageRect(new Image(band), new CoordinateRect(x0, x1, bandLow, stripLow - (0.01 * (high - low))));
            bandImage.AntiAlias = false;
            plot.Legend.ManualItems.Add(new LegendItem { LabelText = "forward sweep", FillColor = Palette.ForwardBranch, LineWidth = 0, MarkerSize = 0 });
            plot.Legend.ManualItems.Add(new LegendItem { LabelText = "backward sweep", FillColor = Palette.BackwardBranch, LineWidth = 0, MarkerSize = 0 });
            plot.Legend.ManualItems.Add(new LegendItem { LabelText = "hysteresis (lower strip)", FillColor = Palette.Hysteresis, LineWidth = 0, MarkerSize = 0 });
            stripLow = bandLow;
        }
        var classes = new CellRaster(nx, 1);
        for (var k = 0; k < plane.Rows.Count; k++)
        {
            var color = CellColor(table, plane.Rows[k], StripMode(mode));
            Paint(plane, k, nx, 1, (i, _) => classes.Paint(i, 0, color));
        }

        using var strip = classes.ToBitmap(columnPixels, 1, Palette.Unknown);
        var stripImage = plot.Add.ImageRect(new Image(strip), new CoordinateRect(x0, x1, low - (0.08 * (high - low)), stripHigh));
        stripImage.AntiAlias = false;
        AddLegend(plot, table, plane.Rows, StripMode(mode));
        plot.Axes.SetLimits(x0, x1, stripLow, high);
        Label(plot, x, $"{variable} (samples; strip: {Describe(StripMode(mode))})");
    }

    /// <summary>
    /// Visits the cells row k covers: its own, or on a refined plane the block around it reaching halfway to its
    /// neighbours of the same level. Rows are painted coarse level first, so finer points overwrite coarser blocks.
    /// </summary>
    private static void Paint(MapPlane plane, int k, int nx, int ny, Action<int, int> cell)
    {
        var x = plane.Cells[k, 0];
        var half = plane.Half?[k];
        var (hx, hy) = (half?[0] ?? 0, half is { Length: > 1 } ? half[1] : 0);
        var y = plane.Cells.Axes > 1 ? plane.Cells[k, 1] : 0;
        for (var i = Math.Max(0, x - hx); i <= Math.Min(nx - 1, x + hx); i++)
        {
            for (var j = Math.Max(0, y - hy); j <= Math.Min(ny - 1, y + hy); j++)
            {
                cell((int)i, (int)j);
            }
        }
    }

    /// <summary>The finite values' range widened to take <paramref name="values"/> in.</summary>
    private static (double Low, double High) Bounds(ReadOnlySpan<double> values, double low, double high)
    {
        foreach (var value in values)
        {
            if (double.IsFinite(value))
            {
                (low, high) = (Math.Min(low, value), Math.Max(high, value));
            }
        }

        return (low, high);
    }

    private static (int[,] Counts, int Most) Density(MapPlane plane, RowValues samples, int columns, int nx, double low, double high)
    {
        var counts = new int[DensityRows, columns];
        var most = 1;
        for (var k = 0; k < plane.Rows.Count; k++)
        {
            var column = (int)(plane.Cells[k, 0] * columns / nx);
            foreach (var value in samples[plane.Rows[k]])
            {
                if (double.IsFinite(value))
                {
                    var rowIndex = Math.Clamp((int)((high - value) / (high - low) * DensityRows), 0, DensityRows - 1);
                    most = Math.Max(most, ++counts[rowIndex, column]);
                }
            }
        }

        return (counts, most);
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

    private static void AddLegend(Plot plot, RunTable table, IReadOnlyList<int> rows, ColorMode mode)
    {
        var items = mode switch
        {
            ColorMode.Period => rows.Select(r => Math.Min(table.Period[r], Palette.PeriodColors.Length + 1)).Distinct().Order()
                .Select(p => (p == 0 ? "none" : p > Palette.PeriodColors.Length ? $"> {Palette.PeriodColors.Length}" : $"period {p}", Palette.ForPeriod(p))),
            ColorMode.Attractor => AttractorLegend(table, rows),
            _ => Engine.Runs.RegimeOrder.Sort(rows.Select(r => table.Regime[r]).Distinct())
                .Select(regime => (regime, Palette.ForRegime(regime))),
        };
        foreach (var (label, color) in items)
        {
            plot.Legend.ManualItems.Add(new LegendItem { LabelText = label, FillColor = color, LineWidth = 0, MarkerSize = 0 });
        }

        plot.ShowLegend(Edge.Right);
        plot.Legend.FontSize = 13;
    }

    /// <summary>One entry per attractor label on the plane (those beyond the palette share one): its number, class and where it sits.</summary>
    private static IEnumerable<(string, Color)> AttractorLegend(RunTable table, IReadOnlyList<int> rows)
    {
        var labels = table.Attractors!;
        var shown = Palette.AttractorColors.Length;
        foreach (var label in rows.Select(r => labels.Label[r]).Select(l => l >= shown ? shown : l).Distinct().Order())
        {
            if (label < 0)
            {
                yield return (label == Engine.Runs.AttractorLabels.Missing ? "not computed" : "not catalogued", Palette.ForAttractor(label));
            }
            else if (label == shown)
            {
                yield return ($"{shown + 1} and beyond", Palette.ForAttractor(label));
            }
            else
            {
                var known = labels.Known[label];
                var period = known.Period > 1 ? $" {known.Period}" : "";
                var at = known.Regime is Core.Analysis.Regime.Divergent ? "" : $" near {known.State[0].ToString("g3", System.Globalization.CultureInfo.InvariantCulture)}";
                yield return ($"{label + 1}: {Core.Analysis.RegimeNames.ToText(known.Regime)}{period}{at}", Palette.ForAttractor(label));
            }
        }
    }

    private static void Label(Plot plot, AxisScale x, string y)
    {
        plot.XLabel(x.Label);
        plot.YLabel(y);
        plot.Axes.Bottom.Label.FontSize = 15;
        plot.Axes.Left.Label.FontSize = 15;
        plot.Axes.Title.Label.FontSize = 16;
        ApplyTicks(plot.Axes.Bottom, x);
    }

    private static void ApplyTicks(ScottPlot.IAxis axis, AxisScale scale)
    {
        if (scale.ManualTicks() is { } ticks)
        {
            axis.TickGenerator = new ScottPlot.TickGenerators.NumericManual(ticks.Positions, ticks.Labels);
        }

        axis.TickLabelStyle.FontSize = 13;
    }

    /// <summary>
    /// The colour scale's half-range: the 95th percentile of |λ1| on the plane, so that a few superstable
    /// points (λ → −∞) do not wash every other cell out to white; beyond it colours saturate.
    /// </summary>
    private static double Limit(RunTable table, MapPlane plane)
    {
        var finite = plane.Rows.Select(r => table.Lyapunov[r]).Where(double.IsFinite).Select(Math.Abs).Order().ToArray();
        return finite.Length == 0 ? 1 : Math.Max(1e-6, finite[(int)(0.95 * (finite.Length - 1))]);
    }

    /// <summary>
    /// The exponents at most <paramref name="rows"/> × <paramref name="columns"/> cells: each the mean of the finite
    /// values under it, clipped to ±<paramref name="limit"/> first (where the colours saturate anyway, so that one
    /// superstable point does not paint its neighbours); NaN where there are none. Smaller grids come back as they are.
    /// </summary>
    internal static double[,] Shrink(double[,] values, int rows, int columns, double limit)
    {
        var (ny, nx) = (values.GetLength(0), values.GetLength(1));
        if (ny <= rows && nx <= columns)
        {
            return values;
        }

        var (height, width) = (Math.Min(ny, rows), Math.Min(nx, columns));
        var shrunk = new double[height, width];
        for (var r = 0; r < height; r++)
        {
            for (var c = 0; c < width; c++)
            {
                var (sum, count) = (0.0, 0);
                for (var j = CellRaster.Start(r, ny, height); j < CellRaster.Start(r + 1, ny, height); j++)
                {
                    for (var i = CellRaster.Start(c, nx, width); i < CellRaster.Start(c + 1, nx, width); i++)
                    {
                        if (!double.IsNaN(values[j, i]))
                        {
                            sum += Math.Clamp(values[j, i], -limit, limit);
                            count++;
                        }
                    }
                }

                shrunk[r, c] = count == 0 ? double.NaN : sum / count;
            }
        }

        return shrunk;
    }

    private static double Clip(double value) => double.IsNegativeInfinity(value) ? -1e300 : value;

    private static string Describe(ColorMode mode) => mode switch
    {
        ColorMode.Period => "period",
        ColorMode.Lyapunov => "largest Lyapunov exponent",
        ColorMode.Attractor => "attractor",
        _ => "regime",
    };

    internal static SKColor ToSkia(Color color) => new(color.R, color.G, color.B, color.A);
}
