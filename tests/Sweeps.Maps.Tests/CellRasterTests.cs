using ScottPlot;

namespace Sweeps.Maps.Tests;

/// <summary>
/// Pictures of cells with more cells than pixels: each pixel takes the colour most of its cells have (or the most
/// important one), cells nobody painted give way to painted ones, and a grid no larger than the picture keeps one
/// pixel per cell. The expected pixels are counted by hand from the cells painted here.
/// </summary>
public sealed class CellRasterTests
{
    private static readonly Color Blue = Color.FromHex("#1F5FA8");
    private static readonly Color Amber = Color.FromHex("#F0A33A");
    private static readonly Color Dark = Color.FromHex("#1A1A1A");
    private static readonly Color Empty = Color.FromHex("#BBBBBB");

    [Fact]
    public void ToBitmap_GivesEachPixelTheCommonestColourOfItsCells_WhenTheGridIsWider()
    {
        // Ten cells in one row onto four pixels: cells 0–1, 2–4, 5–6, 7–9 (c·10/4 rounded down).
        var raster = new CellRaster(10, 1);
        Color[] painted = [Blue, Amber, Amber, Blue, Amber, Dark, Blue, Amber, Dark, Dark];
        for (var i = 0; i < painted.Length; i++)
        {
            raster.Paint(i, 0, painted[i]);
        }

        using var bitmap = raster.ToBitmap(4, 1, Empty);
        Assert.Equal((4, 1), (bitmap.Width, bitmap.Height));

        // 0–1: one blue, one amber — a tie, won by the colour met first (blue); 2–4: amber, 2 of 3; 5–6: dark and blue
        // tie, and blue was met before dark; 7–9: dark, 2 of 3.
        Assert.Equal([Blue, Amber, Blue, Dark], Enumerable.Range(0, 4).Select(c => Of(bitmap.GetPixel(c, 0))));
    }

    [Fact]
    public void ToBitmap_LetsPaintedCellsOutvoteEmptyOnes_AndShowsTheMostImportant_WhenAsked()
    {
        // A 4 × 4 grid onto 2 × 2 pixels. Top left: one amber cell among three empty ones; top right: empty; bottom
        // left: three blue and one dark; bottom right: two amber, two blue.
        var raster = new CellRaster(4, 4);
        raster.Register(Blue);
        raster.Register(Amber);
        raster.Register(Dark);
        raster.Paint(1, 1, Amber);
        foreach (var (i, j) in new[] { (0, 2), (1, 2), (0, 3) })
        {
            raster.Paint(i, j, Blue);
        }

        raster.Paint(1, 3, Dark);
        foreach (var (i, j, color) in new[] { (2, 2, Amber), (3, 2, Amber), (2, 3, Blue), (3, 3, Blue) })
        {
            raster.Paint(i, j, color);
        }

        using var common = raster.ToBitmap(2, 2, Empty);
        Assert.Equal([Amber, Empty, Blue, Blue], Pixels(common));

        // Most important = registered last among those present: dark beats blue, amber beats blue.
        using var important = raster.ToBitmap(2, 2, Empty, CellRaster.Merge.MostImportant);
        Assert.Equal([Amber, Empty, Dark, Amber], Pixels(important));
    }

    [Fact]
    public void ToBitmap_KeepsOnePixelPerCell_WhenTheGridFits()
    {
        var raster = new CellRaster(3, 2);
        raster.Paint(0, 0, Blue);
        raster.Paint(2, 0, Dark);
        raster.Paint(1, 1, Amber);
        raster.Paint(1, 1, Blue); // later paint overwrites earlier, as finer refinement levels do
        using var bitmap = raster.ToBitmap(2048, 2048, Empty);
        Assert.Equal((3, 2), (bitmap.Width, bitmap.Height));
        Assert.Equal([Blue, Empty, Dark, Empty, Blue, Empty], Pixels(bitmap));
    }

    [Fact]
    public void Shrink_AveragesTheClippedFiniteExponents_OfEachBlock()
    {
        // 2 × 4 values onto 1 × 2: the left block {0.1, −∞ clipped to −1, 0.3, NaN} → (0.1 − 1 + 0.3)/3; the right
        // block is all NaN → NaN. Arithmetic by hand.
        double[,] values = { { 0.1, -1e300, double.NaN, double.NaN }, { 0.3, double.NaN, double.NaN, double.NaN } };
        var shrunk = MapRenderer.Shrink(values, 1, 2, limit: 1);
        Assert.Equal((1, 2), (shrunk.GetLength(0), shrunk.GetLength(1)));
        Assert.Equal((0.1 - 1 + 0.3) / 3, shrunk[0, 0], 15);
        Assert.True(double.IsNaN(shrunk[0, 1]));
        Assert.Same(values, MapRenderer.Shrink(values, 2, 4, 1));
    }

    private static Color[] Pixels(SkiaSharp.SKBitmap bitmap) =>
        Enumerable.Range(0, bitmap.Height).SelectMany(r => Enumerable.Range(0, bitmap.Width).Select(c => Of(bitmap.GetPixel(c, r)))).ToArray();

    private static Color Of(SkiaSharp.SKColor color) => new(color.Red, color.Green, color.Blue, color.Alpha);
}
