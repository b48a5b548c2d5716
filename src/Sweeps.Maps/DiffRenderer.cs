using ScottPlot;
using SkiaSharp;
using Sweeps.Engine.Runs;

namespace Sweeps.Maps;

/// <summary>Where on the grid two runs differ: unchanged cells pale, period changes amber, regime changes dark.</summary>
public static class DiffRenderer
{
    public static readonly Color Unchanged = Color.FromHex("#E6E6E6");
    public static readonly Color PeriodChanged = Color.FromHex("#F0A33A");
    public static readonly Color RegimeChanged = Color.FromHex("#1A1A1A");

    public static byte[] Render(RunDirectory run, RunDiff diff, IReadOnlyDictionary<string, double> slices, string title, int width = 1000, int height = 700) =>
        Build(run, diff, slices, title, width, height).GetImageBytes(width, height, ImageFormat.Png);

    internal static Plot Build(RunDirectory run, RunDiff diff, IReadOnlyDictionary<string, double> slices, string title, int width = 1000, int height = 700)
    {
        FontSetup.EnsureRegistered();
        var table = diff.After;
        var plane = MapPlane.Select(run.LoadSpec().Grid, table, slices);
        var x = new AxisScale(plane.Free[0]);
        var nx = (int)plane.Free[0].Count;
        var ny = plane.Free.Count == 2 ? (int)plane.Free[1].Count : 1;
        var (x0, x1) = x.Range();
        var (y0, y1) = plane.Free.Count == 2 ? new AxisScale(plane.Free[1]).Range() : (0.0, 1.0);
        // A pixel standing for several grid cells shows the most important change among them.
        var raster = new CellRaster(nx, ny);
        raster.Register(Unchanged);
        raster.Register(PeriodChanged);
        raster.Register(RegimeChanged);
        for (var k = 0; k < plane.Rows.Count; k++)
        {
            var row = plane.Rows[k];
            var color = diff.Change[row] switch { 2 => RegimeChanged, 1 => PeriodChanged, _ => Unchanged };
            raster.Paint((int)plane.Cells[k, 0], plane.Free.Count == 2 ? ny - 1 - (int)plane.Cells[k, 1] : 0, color);
        }

        using var bitmap = raster.ToBitmap(Math.Max(MapRenderer.MostPixels, width), Math.Max(MapRenderer.MostPixels, height), Palette.Unknown, CellRaster.Merge.MostImportant);

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
