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

    /// <summary>
    /// A map read part by part, the run never held whole, so memory is the picture's whatever the run's size: a regime,
    /// period or exponent map in one pass, a bifurcation diagram in two (the samples' range, then the picture). A refined
    /// run's levels follow its own parts, coarse to fine, each part placed on the finest lattice as <see cref="Render"/>
    /// places it; in attractor colours (which leave the levels out) one catalog labels the parts in order, as it labels
    /// the whole run. Draws what <see cref="Render"/> draws, byte for byte.
    /// </summary>
    public static async Task<byte[]> RenderStreamedAsync(RunDirectory run, MapRequest request, string title, CancellationToken token = default) =>
        (await BuildStreamedAsync(run, request, title, token)).GetImageBytes(request.Width, request.Height, ImageFormat.Png);

    internal static async Task<Plot> BuildStreamedAsync(RunDirectory run, MapRequest request, string title, CancellationToken token)
    {
        FontSetup.EnsureRegistered();
        var spec = run.LoadSpec();
        var pixels = Pixels(request);
        var bifurcation = DrawsSamples(spec.Grid, request);
        var attractors = request.Color == ColorMode.Attractor;
        var finest = attractors ? 0 : run.FinishedLevels();
        var exact = MapPlane.ExactSlices(spec.Grid, request.Slices);
        MapPlane Cut(int level, RunTable part) =>
            finest == 0 ? MapPlane.Select(spec.Grid, part, request.Slices) : MapPlane.SelectLevel(spec.Grid, level, finest, part, exact);

        // The run's parts, then each level's, coarse to fine: finer points paint over the coarser blocks around them.
        async IAsyncEnumerable<(int Level, RunTable Part)> Parts(bool samples, bool pointsAndSamplesOnly)
        {
            if (attractors && !pointsAndSamplesOnly)
            {
                await foreach (var part in RunTable.ReadEachPartWithAttractorsAsync(run, samples, token))
                {
                    yield return (0, part);
                }

                yield break;
            }

            for (var level = 0; level <= finest; level++)
            {
                await foreach (var part in RunTable.ReadEachLevelPartAsync(run, level, samples, pointsAndSamplesOnly, token))
                {
                    yield return (level, part);
                }
            }
        }

        MapPlane? first = null;
        BifurcationPicture? line = null;
        PlanePicture? plane = null;
        await foreach (var (level, part) in Parts(samples: bifurcation, pointsAndSamplesOnly: bifurcation))
        {
            var cut = Cut(level, part);
            first ??= cut;
            if (bifurcation)
            {
                // First pass: the samples' range.
                line ??= new BifurcationPicture(cut.Free[0], request.Color, spec.Grid.Follow is not null);
                line.Measure(part, cut);
            }
            else
            {
                plane ??= new PlanePicture(cut, request.Color);
                plane.Add(part, cut);
            }
        }

        if (first is null)
        {
            // No part written yet: nothing to stream, the in-memory drawing handles the empty run.
            return Build(run, await RunTable.ReadAsync(run, samples: bifurcation, attractors, token), request, title);
        }

        var plot = new Plot();
        plot.FigureBackground.Color = Colors.White;
        if (line is not null)
        {
            await foreach (var (level, part) in Parts(samples: true, pointsAndSamplesOnly: false))
            {
                line.Add(part, Cut(level, part));
            }

            line.Draw(plot, spec.Model.Variables[0], pixels.Columns);
        }
        else
        {
            plane!.Draw(plot, pixels);
        }

        plot.Title(Heading(title, request, first));
        return plot;
    }

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
        var pixels = Pixels(request);
        if (plane.Free.Count == 2)
        {
            DrawPlane(plot, table, plane, request.Color, pixels);
        }
        else
        {
            DrawBifurcation(plot, table, plane, request.Color, run.LoadSpec().Model.Variables[0], pixels.Columns);
        }

        plot.Title(Heading(title, request, plane));
        return plot;
    }

    /// <summary>The most pixels a picture of cells gets along each axis for <paramref name="request"/>.</summary>
    private static (int Columns, int Rows) Pixels(MapRequest request) => (Math.Max(MostPixels, request.Width), Math.Max(MostPixels, request.Height));

    /// <summary>The title: what the colours show (a bifurcation diagram: the samples), and the fixed axes if any.</summary>
    private static string Heading(string title, MapRequest request, MapPlane plane) =>
        $"{title}: {(plane.Free.Count == 2 ? Describe(request.Color) : "attractor samples")}{(plane.Description.Length > 0 ? $" ({plane.Description})" : "")}";

    /// <summary>Colours of categorical cells, for maps and for the strip of a bifurcation diagram.</summary>
    internal static Color CellColor(RunTable table, int row, ColorMode mode) => mode switch
    {
        ColorMode.Period => Palette.ForPeriod(table.Period[row]),
        ColorMode.Attractor => Palette.ForAttractor(AttractorLabel(table, row)),
        _ => Palette.ForRegime(table.Regime[row]),
    };

    private static int AttractorLabel(RunTable table, int row) =>
        (table.Attractors ?? throw new InvalidOperationException("attractor labels were not read")).Label[row];

    private static void DrawPlane(Plot plot, RunTable table, MapPlane plane, ColorMode mode, (int Columns, int Rows) pixels)
    {
        var picture = new PlanePicture(plane, mode);
        picture.Add(table, plane);
        picture.Draw(plot, pixels);
    }

    private static void DrawBifurcation(Plot plot, RunTable table, MapPlane plane, ColorMode mode, string variable, int columnPixels)
    {
        var picture = new BifurcationPicture(plane.Free[0], mode, table.Hysteresis is not null);
        picture.Measure(table, plane);
        picture.Add(table, plane);
        picture.Draw(plot, variable, columnPixels);
    }

    /// <summary>
    /// The cells row k covers, as ranges of columns and rows (both inclusive): its own, or on a refined plane the block
    /// around it reaching halfway to its neighbours of the same level. Rows are painted coarse level first, so finer
    /// points overwrite coarser blocks.
    /// </summary>
    internal static (int Left, int Right, int Bottom, int Top) Cover(MapPlane plane, int k, int nx, int ny)
    {
        var x = plane.Cells[k, 0];
        var half = plane.Half?[k];
        var (hx, hy) = (half?[0] ?? 0, half is { Length: > 1 } ? half[1] : 0);
        var y = plane.Cells.Axes > 1 ? plane.Cells[k, 1] : 0;
        return ((int)Math.Max(0, x - hx), (int)Math.Min(nx - 1, x + hx), (int)Math.Max(0, y - hy), (int)Math.Min(ny - 1, y + hy));
    }

    /// <summary>The legend's period entry a period falls in: 1 … 8 their own, beyond that one bucket, 0 for none.</summary>
    internal static int PeriodBucket(int period) => Math.Min(period, Palette.PeriodColors.Length + 1);

    internal static IEnumerable<(string, Color)> PeriodLegend(IEnumerable<int> buckets) =>
        buckets.Distinct().Order().Select(p => (p == 0 ? "none" : p > Palette.PeriodColors.Length ? $"> {Palette.PeriodColors.Length}" : $"period {p}", Palette.ForPeriod(p)));

    internal static IEnumerable<(string, Color)> RegimeLegend(IEnumerable<string> regimes) =>
        Engine.Runs.RegimeOrder.Sort(regimes.Distinct()).Select(regime => (regime, Palette.ForRegime(regime)));

    internal static void ShowLegend(Plot plot, IEnumerable<(string Label, Color Color)> items)
    {
        foreach (var (label, color) in items)
        {
            plot.Legend.ManualItems.Add(new LegendItem { LabelText = label, FillColor = color, LineWidth = 0, MarkerSize = 0 });
        }

        plot.ShowLegend(Edge.Right);
        plot.Legend.FontSize = 13;
    }

    /// <summary>An attractor label as the legend groups it: labels beyond the palette share one entry.</summary>
    internal static int AttractorBucket(int label) => Math.Min(label, Palette.AttractorColors.Length);

    /// <summary>One entry per attractor label met (<see cref="AttractorBucket"/>): its number, class and where it sits.</summary>
    internal static IEnumerable<(string, Color)> AttractorLegend(IEnumerable<int> buckets, IReadOnlyList<Core.Attractors.AttractorSignature> known)
    {
        var shown = Palette.AttractorColors.Length;
        foreach (var label in buckets.Distinct().Order())
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
                var attractor = known[label];
                var period = attractor.Period > 1 ? $" {attractor.Period}" : "";
                var at = attractor.Regime is Core.Analysis.Regime.Divergent ? "" : $" near {attractor.State[0].ToString("g3", System.Globalization.CultureInfo.InvariantCulture)}";
                yield return ($"{label + 1}: {Core.Analysis.RegimeNames.ToText(attractor.Regime)}{period}{at}", Palette.ForAttractor(label));
            }
        }
    }

    internal static void Label(Plot plot, AxisScale x, string y)
    {
        plot.XLabel(x.Label);
        plot.YLabel(y);
        plot.Axes.Bottom.Label.FontSize = 15;
        plot.Axes.Left.Label.FontSize = 15;
        plot.Axes.Title.Label.FontSize = 16;
        ApplyTicks(plot.Axes.Bottom, x);
    }

    internal static void ApplyTicks(ScottPlot.IAxis axis, AxisScale scale)
    {
        if (scale.ManualTicks() is { } ticks)
        {
            axis.TickGenerator = new ScottPlot.TickGenerators.NumericManual(ticks.Positions, ticks.Labels);
        }

        axis.TickLabelStyle.FontSize = 13;
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

    internal static string Describe(ColorMode mode) => mode switch
    {
        ColorMode.Period => "period",
        ColorMode.Lyapunov => "largest Lyapunov exponent",
        ColorMode.Attractor => "attractor",
        _ => "regime",
    };

    internal static SKColor ToSkia(Color color) => new(color.R, color.G, color.B, color.A);
}
