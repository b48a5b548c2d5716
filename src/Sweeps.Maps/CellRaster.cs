using ScottPlot;
using SkiaSharp;

namespace Sweeps.Maps;

/// <summary>
/// A picture of categorical cells of a grid plane (regimes, periods, attractors, changes). Cells are painted at the
/// grid's own resolution — one byte per cell, the index of its colour, 0 where no point is — so later paint
/// overwrites earlier as before; the bitmap handed to the plot is then at most so many pixels wide and high, each
/// pixel taking the colour that most of its cells have (or, for <see cref="Merge.MostImportant"/>, the colour
/// registered last among them). A grid far wider than the picture (a 10^6-point strip) is thus drawn as the
/// picture can show it, instead of as a bitmap the renderer shrinks: that took 18 s, this takes milliseconds.
/// </summary>
internal sealed class CellRaster
{
    /// <summary>How the cells under one pixel give it a colour.</summary>
    public enum Merge
    {
        /// <summary>The colour most of the painted cells have (ties: the one registered first).</summary>
        MostCommon,

        /// <summary>The colour registered last among the painted cells (register the most important last).</summary>
        MostImportant,
    }

    private readonly byte[] cells;
    private readonly List<Color> colors = [default];
    private readonly Dictionary<uint, byte> indices = [];

    public CellRaster(int columns, int rows)
    {
        (Columns, Rows) = (columns, rows);
        cells = new byte[checked(columns * rows)];
    }

    public int Columns { get; }

    public int Rows { get; }

    /// <summary>Gives <paramref name="color"/> its index now (for <see cref="Merge.MostImportant"/>: in rising importance).</summary>
    public void Register(Color color) => IndexOf(color);

    /// <summary>Paints the cell in <paramref name="column"/>, <paramref name="row"/> (row 0 at the top).</summary>
    public void Paint(int column, int row, Color color) => cells[(row * Columns) + column] = IndexOf(color);

    /// <summary>
    /// The picture, at most <paramref name="maxColumns"/> × <paramref name="maxRows"/> pixels: pixel (c, r) stands for
    /// the cells from c·columns/width to (c + 1)·columns/width (and the same down); <paramref name="empty"/> where none
    /// of them was painted.
    /// </summary>
    public SKBitmap ToBitmap(int maxColumns, int maxRows, Color empty, Merge merge = Merge.MostCommon)
    {
        var (width, height) = (Math.Min(Columns, Math.Max(1, maxColumns)), Math.Min(Rows, Math.Max(1, maxRows)));
        var pixels = new SKColor[width * height];
        var counts = new int[colors.Count];
        var palette = colors.Select((c, k) => k == 0 ? MapRenderer.ToSkia(empty) : MapRenderer.ToSkia(c)).ToArray();
        for (var r = 0; r < height; r++)
        {
            var (top, bottom) = (Start(r, Rows, height), Start(r + 1, Rows, height));
            for (var c = 0; c < width; c++)
            {
                var (left, right) = (Start(c, Columns, width), Start(c + 1, Columns, width));
                Array.Clear(counts);
                for (var j = top; j < bottom; j++)
                {
                    var at = j * Columns;
                    for (var i = left; i < right; i++)
                    {
                        counts[cells[at + i]]++;
                    }
                }

                pixels[(r * width) + c] = palette[Choose(counts, merge)];
            }
        }

        return new SKBitmap(width, height) { Pixels = pixels };
    }

    /// <summary>The first of <paramref name="count"/> cells that part <paramref name="part"/> of <paramref name="parts"/> covers.</summary>
    internal static int Start(int part, int count, int parts) => (int)((long)part * count / parts);

    private static int Choose(int[] counts, Merge merge)
    {
        var best = 0;
        for (var k = 1; k < counts.Length; k++)
        {
            if (counts[k] > 0 && (merge == Merge.MostImportant || best == 0 || counts[k] > counts[best]))
            {
                best = k;
            }
        }

        return best;
    }

    private byte IndexOf(Color color)
    {
        var key = color.ARGB;
        if (!indices.TryGetValue(key, out var index))
        {
            if (colors.Count > byte.MaxValue)
            {
                throw new InvalidOperationException("more than 255 colours in one picture");
            }

            index = (byte)colors.Count;
            colors.Add(color);
            indices[key] = index;
        }

        return index;
    }
}
