using ScottPlot;
using Sweeps.Engine.Runs;
using Sweeps.Engine.Specs;

namespace Sweeps.Maps;

/// <summary>
/// Where on the grid two runs differ: unchanged cells pale, period changes amber, regime changes dark. Built as the
/// diff reads the second run part by part (<see cref="Add"/>, handed to <see cref="RunDiff.CompareAsync"/>), so only
/// the picture's cells stay in memory.
/// </summary>
public sealed class DiffRenderer(Grid grid, IReadOnlyDictionary<string, double> slices)
{
    public static readonly Color Unchanged = Color.FromHex("#E6E6E6");
    public static readonly Color PeriodChanged = Color.FromHex("#F0A33A");
    public static readonly Color RegimeChanged = Color.FromHex("#1A1A1A");

    private MapPlane? first;
    private CellRaster? raster;
    private ArgumentException? refused;

    /// <summary>Paints a part of the second run: each row's change code (<see cref="RunDiff.Unchanged"/>, …) at its cell.</summary>
    public void Add(RunTable part, byte[] codes)
    {
        if (refused is not null)
        {
            return;
        }

        MapPlane plane;
        try
        {
            plane = MapPlane.Select(grid, part, slices);
        }
        catch (ArgumentException error)
        {
            // A plane that cannot be drawn (a wrong slice, too many free axes) is reported when the picture is asked for:
            // runs without changes need no picture.
            refused = error;
            return;
        }

        first ??= plane;
        var (nx, ny) = ((int)plane.Free[0].Count, plane.Free.Count == 2 ? (int)plane.Free[1].Count : 1);
        if (raster is null)
        {
            // A pixel standing for several grid cells shows the most important change among them.
            raster = new CellRaster(nx, ny);
            raster.Register(Unchanged);
            raster.Register(PeriodChanged);
            raster.Register(RegimeChanged);
        }

        for (var k = 0; k < plane.Rows.Count; k++)
        {
            var color = codes[plane.Rows[k]] switch { RunDiff.Regime => RegimeChanged, RunDiff.PeriodOnly => PeriodChanged, _ => Unchanged };
            raster.Paint((int)plane.Cells[k, 0], plane.Free.Count == 2 ? ny - 1 - (int)plane.Cells[k, 1] : 0, color);
        }
    }

    public byte[] Render(RunDiff diff, string title, int width = 1000, int height = 700) =>
        Build(diff, title, width, height).GetImageBytes(width, height, ImageFormat.Png);

    internal Plot Build(RunDiff diff, string title, int width = 1000, int height = 700)
    {
        if (refused is not null)
        {
            throw refused;
        }

        FontSetup.EnsureRegistered();
        var plane = first ?? MapPlane.Select(grid, RunTable.Empty(grid.Axes.Count), slices);
        var x = new AxisScale(plane.Free[0]);
        var nx = (int)plane.Free[0].Count;
        var ny = plane.Free.Count == 2 ? (int)plane.Free[1].Count : 1;
        var (x0, x1) = x.Range();
        var (y0, y1) = plane.Free.Count == 2 ? new AxisScale(plane.Free[1]).Range() : (0.0, 1.0);
        using var bitmap = (raster ?? new CellRaster(nx, ny)).ToBitmap(Math.Max(MapRenderer.MostPixels, width), Math.Max(MapRenderer.MostPixels, height), Palette.Unknown, CellRaster.Merge.MostImportant);

        var plot = new Plot();
        plot.FigureBackground.Color = Colors.White;
        var image = plot.Add.ImageRect(new Image(bitmap), new CoordinateRect(x0, x1, y0, y1));
        image.AntiAlias = false;
        plot.Axes.SetLimits(x0, x1, y0, y1);
        plot.Legend.ManualItems.Add(new LegendItem { LabelText = $"unchanged", FillColor = Unchanged, LineWidth = 0 });
        plot.Legend.ManualItems.Add(new LegendItem { LabelText = $"period changed ({diff.PeriodChanged:N0})", FillColor = PeriodChanged, LineWidth = 0 });
        plot.Legend.ManualItems.Add(new LegendItem { LabelText = $"regime changed ({diff.RegimeChanged:N0})", FillColor = RegimeChanged, LineWidth = 0 });
        plot.ShowLegend(Edge.Right);
        plot.Title($"{title}{(plane.Description.Length > 0 ? $" ({plane.Description})" : "")}");
        plot.XLabel(x.Label);
        plot.YLabel(plane.Free.Count == 2 ? new AxisScale(plane.Free[1]).Label : "");
        if (plane.Free.Count == 1)
        {
            plot.Axes.Left.TickGenerator = new ScottPlot.TickGenerators.NumericManual([], []);
        }

        return plot;
    }
}
