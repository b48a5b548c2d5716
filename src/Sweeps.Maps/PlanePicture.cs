using ScottPlot;
using Sweeps.Engine.Runs;

namespace Sweeps.Maps;

/// <summary>
/// A map of two axes built up from tables of rows: each table paints its rows' cells (<see cref="Add"/>) — classes into
/// a <see cref="CellRaster"/>, or exponents into a grid of values — and notes its legend entries; <see cref="Draw"/>
/// draws the whole. A run held in memory is one table (refined levels included); a run read part by part is one table
/// per part, and only the painted cells stay in memory.
/// </summary>
internal sealed class PlanePicture(MapPlane first, ColorMode mode)
{
    private readonly int nx = (int)first.Free[0].Count;
    private readonly int ny = (int)first.Free[1].Count;
    private readonly LegendKeys legend = new(mode);
    private readonly List<double> magnitudes = [];
    private CellRaster? raster;
    private double[,]? values;

    public void Add(RunTable table, MapPlane plane)
    {
        if (mode == ColorMode.Lyapunov)
        {
            values ??= Empty(ny, nx);
            for (var k = 0; k < plane.Rows.Count; k++)
            {
                var exponent = table.Lyapunov[plane.Rows[k]];
                var value = double.IsNegativeInfinity(exponent) ? -1e300 : exponent;
                var (left, right, bottom, top) = MapRenderer.Cover(plane, k, nx, ny);
                for (var i = left; i <= right; i++)
                {
                    for (var j = bottom; j <= top; j++)
                    {
                        values[ny - 1 - j, i] = value;
                    }
                }

                if (double.IsFinite(exponent))
                {
                    magnitudes.Add(Math.Abs(exponent));
                }
            }

            return;
        }

        raster ??= new CellRaster(nx, ny);
        for (var k = 0; k < plane.Rows.Count; k++)
        {
            var row = plane.Rows[k];
            var color = MapRenderer.CellColor(table, row, mode);
            var (left, right, bottom, top) = MapRenderer.Cover(plane, k, nx, ny);
            for (var i = left; i <= right; i++)
            {
                for (var j = bottom; j <= top; j++)
                {
                    raster.Paint(i, ny - 1 - j, color);
                }
            }
        }

        legend.Note(table, plane.Rows);
    }

    public void Draw(Plot plot, (int Columns, int Rows) pixels)
    {
        var (x, y) = (new AxisScale(first.Free[0]), new AxisScale(first.Free[1]));
        var (x0, x1) = x.Range();
        var (y0, y1) = y.Range();
        if (mode == ColorMode.Lyapunov)
        {
            var limit = Limit();
            var heatmap = plot.Add.Heatmap(MapRenderer.Shrink(values ?? Empty(ny, nx), pixels.Rows, pixels.Columns, limit));
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
            using var bitmap = (raster ?? new CellRaster(nx, ny)).ToBitmap(pixels.Columns, pixels.Rows, Palette.Unknown);
            var image = plot.Add.ImageRect(new Image(bitmap), new CoordinateRect(x0, x1, y0, y1));
            image.AntiAlias = false;
            legend.Show(plot);
        }

        plot.Axes.SetLimits(x0, x1, y0, y1);
        MapRenderer.Label(plot, x, y.Label);
        MapRenderer.ApplyTicks(plot.Axes.Left, y);
    }

    /// <summary>
    /// The colour scale's half-range: the 95th percentile of |λ1| on the plane, so that a few superstable points (λ → −∞)
    /// do not wash every other cell out to white; beyond it colours saturate.
    /// </summary>
    private double Limit()
    {
        if (magnitudes.Count == 0)
        {
            return 1;
        }

        magnitudes.Sort();
        return Math.Max(1e-6, magnitudes[(int)(0.95 * (magnitudes.Count - 1))]);
    }

    private static double[,] Empty(int rows, int columns)
    {
        var empty = new double[rows, columns];
        for (var i = 0; i < rows; i++)
        {
            for (var j = 0; j < columns; j++)
            {
                empty[i, j] = double.NaN;
            }
        }

        return empty;
    }
}
