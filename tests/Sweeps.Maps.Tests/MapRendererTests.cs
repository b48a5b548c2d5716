using ScottPlot;
using SkiaSharp;
using Sweeps.Engine.Runs;

namespace Sweeps.Maps.Tests;

/// <summary>
/// Maps drawn from real runs: the PNG decodes, has the asked size, and where the run says a band is,
/// the picture has that band's colour. The logistic family's 2-cycle lives for 3 < r < 1 + √6 and its
/// fixed point for 1 < r < 3 (exact: f'(x*) = 2 − r, (f²)' = 4 + 2r − r²).
/// </summary>
public sealed class MapRendererTests : IDisposable
{
    private readonly string folder = Path.Combine(Path.GetTempPath(), "sweeps-maps-" + Guid.NewGuid().ToString("N")[..10]);

    [Fact]
    public async Task RegimeMap_ColoursThePeriodTwoBand_WhereTheRunHasIt()
    {
        var run = await TestRuns.CreateAsync(folder, TestRuns.Logistic("r = { from = 2.6, to = 3.6, steps = 101 }\nx = { from = 0.2, to = 0.8, steps = 7 }"));
        var table = await RunTable.ReadAsync(run, samples: false);
        var request = new MapRequest(ColorMode.Period, new Dictionary<string, double>(), 800, 500);
        var plot = MapRenderer.Build(run, table, request, "logistic");
        using var bitmap = Decode(plot.GetImageBytes(800, 500, ImageFormat.Png));
        Assert.Equal(800, bitmap.Width);
        Assert.Equal(500, bitmap.Height);
        AssertColor(bitmap, plot.GetPixel(new Coordinates(3.2, 0.5)), Palette.ForPeriod(2));
        AssertColor(bitmap, plot.GetPixel(new Coordinates(2.8, 0.35)), Palette.ForPeriod(1));
        AssertColor(bitmap, plot.GetPixel(new Coordinates(3.5, 0.65)), Palette.ForPeriod(4));
    }

    [Fact]
    public async Task RegimeMap_ShowsRegimesAndExponents_AsAskedFor()
    {
        var run = await TestRuns.CreateAsync(folder, TestRuns.Logistic("r = { from = 2.6, to = 4.0, steps = 141 }\nx = { from = 0.2, to = 0.8, steps = 5 }"));
        var table = await RunTable.ReadAsync(run, samples: false);
        var regimes = MapRenderer.Build(run, table, new MapRequest(ColorMode.Regime, new Dictionary<string, double>()), "logistic");
        using var regimeImage = Decode(regimes.GetImageBytes(1000, 700, ImageFormat.Png));
        AssertColor(regimeImage, regimes.GetPixel(new Coordinates(2.8, 0.5)), Palette.ForRegime("fixed-point"));
        AssertColor(regimeImage, regimes.GetPixel(new Coordinates(4.0, 0.35)), Palette.ForRegime("chaotic"));

        // Exact: x0 = 1/2 at r = 4 goes to 1, then sticks on the unstable fixed point 0 — shown as unresolved.
        AssertColor(regimeImage, regimes.GetPixel(new Coordinates(4.0, 0.5)), Palette.ForRegime("unresolved"));

        // λ1 = ln 2 > 0 at r = 4 (May 1976) is red, the stable fixed point at r = 2.65 (λ = ln 0.65 < 0) is blue.
        var exponents = MapRenderer.Build(run, table, new MapRequest(ColorMode.Lyapunov, new Dictionary<string, double>()), "logistic");
        using var exponentImage = Decode(exponents.GetImageBytes(1000, 700, ImageFormat.Png));
        var hot = exponentImage.GetPixel((int)exponents.GetPixel(new Coordinates(3.99, 0.35)).X, (int)exponents.GetPixel(new Coordinates(3.99, 0.35)).Y);
        var cold = exponentImage.GetPixel((int)exponents.GetPixel(new Coordinates(2.65, 0.5)).X, (int)exponents.GetPixel(new Coordinates(2.65, 0.5)).Y);
        Assert.True(hot.Red > hot.Blue + 40, $"λ > 0 should be red, got {hot}");
        Assert.True(cold.Blue > cold.Red + 40, $"λ < 0 should be blue, got {cold}");
    }

    [Fact]
    public async Task BifurcationDiagram_DrawsTwoBranchesAndTheStrip_ForPeriodTwo()
    {
        var run = await TestRuns.CreateAsync(folder, TestRuns.Logistic("r = { from = 2.8, to = 3.4, steps = 121 }"));
        var table = await RunTable.ReadAsync(run, samples: true);
        var plot = MapRenderer.Build(run, table, new MapRequest(ColorMode.Regime, new Dictionary<string, double>()), "logistic");
        using var image = Decode(plot.GetImageBytes(900, 600, ImageFormat.Png));

        // Exact: the 2-cycle at r = 3.2 is x± = (r + 1 ± √((r − 3)(r + 1)))/(2r) = 0.7995, 0.5130.
        var r = 3.2;
        var root = Math.Sqrt((r - 3) * (r + 1));
        foreach (var branch in new[] { (r + 1 + root) / (2 * r), (r + 1 - root) / (2 * r) })
        {
            // The branch is about a pixel thick: look within ±2 pixels of where it should be.
            var at = plot.GetPixel(new Coordinates(r, branch));
            var darkest = Enumerable.Range(-2, 5).SelectMany(dx => Enumerable.Range(-2, 5).Select(dy => image.GetPixel((int)at.X + dx, (int)at.Y + dy).Red)).Min();
            Assert.True(darkest < 200, $"a dense branch at x = {branch} should be dark near ({at.X}, {at.Y})");
        }

        var between = plot.GetPixel(new Coordinates(r, 0.65));
        Assert.True(image.GetPixel((int)between.X, (int)between.Y).Red > 230, "between the branches there are no samples");
        var strip = table.Samples!.Count;
        Assert.Equal(121, strip);
    }

    // Exact: the fixed point 1 − 1/r is stable for r < 3, the 2-cycle for 3 < r < 1 + √6. A grid of 6 001 points is
    // wider than any picture: the strip then has a pixel for several points, each showing the class most of them have.
    [Fact]
    public async Task BifurcationDiagram_OfAGridWiderThanThePicture_KeepsTheClassesInPlace()
    {
        var run = await TestRuns.CreateAsync(folder, TestRuns.Logistic("r = { from = 2.8, to = 3.2, steps = 6001 }"), chunkSize: 3000);
        var table = await RunTable.ReadAsync(run, samples: true);
        var plot = MapRenderer.Build(run, table, new MapRequest(ColorMode.Regime, new Dictionary<string, double>()), "logistic");
        using var image = Decode(plot.GetImageBytes(1000, 700, ImageFormat.Png));

        // The strip lies 2–8 % of the sample range below the lowest sample (which is 3 % below the data).
        var finite = table.Samples!.All.ToArray().Where(double.IsFinite).ToArray();
        var span = finite.Max() - finite.Min();
        var (low, high) = (finite.Min() - (0.03 * span), finite.Max() + (0.03 * span));
        var y = low - (0.05 * (high - low));
        AssertColor(image, plot.GetPixel(new Coordinates(2.9, y)), Palette.ForRegime("fixed-point"));
        AssertColor(image, plot.GetPixel(new Coordinates(3.1, y)), Palette.ForRegime("periodic"));
        Assert.All(plot.GetPlottables().OfType<ScottPlot.Plottables.ImageRect>(), i => Assert.True(i.Image!.Width <= MapRenderer.MostPixels, $"an image {i.Image.Width} pixels wide"));
    }

    // Exact: the odd cubic map x' = a·x − x³ has the stable fixed points ±√(a − 1) for 1 < a < 2, and orbits from
    // (0, 1] stay positive (from [−1, 0) negative). A basin picture over (a, x0) therefore shows two attractors per
    // value of a, and the same attractor keeps its colour in every cell that reaches it.
    [Fact]
    public async Task AttractorMap_GivesEachAttractorOneColour_AcrossTheGrid()
    {
        var config = TestRuns.Cubic("a = { values = [1.3, 1.5, 1.7] }\nx = { from = -0.95, to = 0.95, steps = 20 }");
        var run = await TestRuns.CreateAsync(folder, config, chunkSize: 7);
        var table = await RunTable.ReadAsync(run, samples: false, attractors: true);
        var labels = table.Attractors!;
        Assert.Equal(6, labels.Known.Count);
        for (var a = 0; a < 3; a++)
        {
            // Point order: a slowest; for each a the negative starts come first.
            Assert.All(Enumerable.Range(0, 10), i => Assert.Equal(2 * a, labels.Label[(20 * a) + i]));
            Assert.All(Enumerable.Range(10, 10), i => Assert.Equal((2 * a) + 1, labels.Label[(20 * a) + i]));
        }

        var plot = MapRenderer.Build(run, table, new MapRequest(ColorMode.Attractor, new Dictionary<string, double>()), "cubic");
        using var image = Decode(plot.GetImageBytes(1000, 700, ImageFormat.Png));
        // Listed axis values sit at their index: a = 1.3 at 0, 1.7 at 2.
        AssertColor(image, plot.GetPixel(new Coordinates(0, -0.5)), Palette.ForAttractor(0));
        AssertColor(image, plot.GetPixel(new Coordinates(0, 0.5)), Palette.ForAttractor(1));
        AssertColor(image, plot.GetPixel(new Coordinates(2, -0.8)), Palette.ForAttractor(4));
        AssertColor(image, plot.GetPixel(new Coordinates(2, 0.8)), Palette.ForAttractor(5));
        Tolerance(Math.Sqrt(0.7), labels.Known[5].State[0]);
    }

    // Exact: the 2-cycle turns into a 4-cycle at r2 = 1 + √6 = 3.44949 ((f²)' = 4 + 2r − r² reaches −1). On a grid of
    // spacing 0.02 the cell drawn at r = 3.441 belongs to the point r = 3.45 (period 4); refinement adds r = 3.44
    // (period 2), whose finer cell then covers it — the map shows the boundary where it is.
    [Fact]
    public async Task RegimeMap_DrawsRefinedPointsAtTheFinestResolution()
    {
        var run = await TestRuns.CreateAsync(folder, TestRuns.Logistic("r = { from = 3.315, to = 3.515, steps = 11 }\nx = { values = [0.3, 0.6] }"));
        var table = await RunTable.ReadAsync(run, samples: false);
        var request = new MapRequest(ColorMode.Period, new Dictionary<string, double>());
        var coarse = MapRenderer.Build(run, table, request, "logistic");
        using var coarseImage = Decode(coarse.GetImageBytes(1000, 700, ImageFormat.Png));
        AssertColor(coarseImage, coarse.GetPixel(new Coordinates(3.447, 0)), Palette.ForPeriod(4));

        var reports = await Engine.Refinement.Refiner.RunAsync(run, 2, 1, null, CancellationToken.None);
        Assert.Equal([1, 1], reports.Select(r => (int)Math.Min(r.Points, 1)));
        var levels = new List<RunTable>();
        for (var level = 1; level <= run.FinishedLevels(); level++)
        {
            levels.Add(await RunTable.ReadLevelAsync(run, level, samples: false));
        }

        var refined = MapRenderer.Build(run, table, request, "logistic", levels);
        using var refinedImage = Decode(refined.GetImageBytes(1000, 700, ImageFormat.Png));
        AssertColor(refinedImage, refined.GetPixel(new Coordinates(3.447, 0)), Palette.ForPeriod(2));
        AssertColor(refinedImage, refined.GetPixel(new Coordinates(3.47, 1)), Palette.ForPeriod(4));
        AssertColor(refinedImage, refined.GetPixel(new Coordinates(3.35, 1)), Palette.ForPeriod(2));
    }

    // The same picture either way: a map read part by part (the run never held whole) against the same map from the run
    // read whole — byte for byte: bifurcation diagrams in both strip colourings, on a line cut from two axes and for a
    // continuation sweep; maps of two axes in regime, period and exponent colours.
    [Fact]
    public async Task Map_ReadPartByPart_IsTheSamePicture()
    {
        var line = await TestRuns.CreateAsync(Path.Combine(folder, "line"), TestRuns.Logistic("r = { from = 2.8, to = 4.0, steps = 301 }"), chunkSize: 40);
        var plane = await TestRuns.CreateAsync(Path.Combine(folder, "plane"), TestRuns.Logistic("r = { from = 2.8, to = 4.0, steps = 61 }\nx = { from = 0.2, to = 0.8, steps = 3 }"), chunkSize: 25);

        // A continuation sweep across the folds of x' = r + x − x³ (both branches and the hysteresis strip), in lines of 41.
        const string fold = """
            [model]
            kind = "flow"
            variables = ["x"]
            parameters = ["r"]
            [model.equations]
            x = "r + x - x^3"
            [initial]
            x = -1.5
            [grid]
            r = { from = -0.6, to = 0.6, steps = 41 }
            follow = "r"
            [analysis]
            transient = 100
            measure = 20
            [integrator]
            method = "rk4"
            step = 0.01
            """;
        var branches = await TestRuns.CreateAsync(Path.Combine(folder, "fold"), fold, chunkSize: 41);
        var bothWays = MapRenderer.Render(branches, await RunTable.ReadAsync(branches, samples: true), new MapRequest(ColorMode.Regime, new Dictionary<string, double>()), "fold");
        Assert.Equal(bothWays, await MapRenderer.RenderStreamedAsync(branches, new MapRequest(ColorMode.Regime, new Dictionary<string, double>()), "fold"));
        foreach (var (run, request) in new[]
        {
            (line, new MapRequest(ColorMode.Regime, new Dictionary<string, double>(), 900, 600)),
            (line, new MapRequest(ColorMode.Period, new Dictionary<string, double>(), 900, 600)),
            (plane, new MapRequest(ColorMode.Regime, new Dictionary<string, double> { ["x"] = 0.5 }, 900, 600)),
            (plane, new MapRequest(ColorMode.Regime, new Dictionary<string, double>())),
            (plane, new MapRequest(ColorMode.Period, new Dictionary<string, double>())),
            (plane, new MapRequest(ColorMode.Lyapunov, new Dictionary<string, double>())),
        })
        {
            Assert.True(Directory.GetFiles(run.PartsPath).Length > 2, "the runs have several parts");
            var whole = MapRenderer.Render(run, await RunTable.ReadAsync(run, samples: MapRenderer.DrawsSamples(run.LoadSpec().Grid, request)), request, "logistic");
            var streamed = await MapRenderer.RenderStreamedAsync(run, request, "logistic");
            Assert.Equal(whole, streamed);
        }
    }

    // A refined run read part by part — its own parts, then each level's — against the same run and levels read whole and
    // merged on the finest lattice: byte for byte, as a bifurcation diagram and as maps of two axes in every colouring
    // that streams, sliced too.
    [Fact]
    public async Task RefinedMap_ReadPartByPart_IsTheSamePicture()
    {
        var line = await TestRuns.CreateAsync(Path.Combine(folder, "refined-line"), TestRuns.Logistic("r = { from = 2.9, to = 3.6, steps = 36 }"), chunkSize: 9);
        var plane = await TestRuns.CreateAsync(Path.Combine(folder, "refined-plane"), TestRuns.Logistic("r = { from = 3.3, to = 3.6, steps = 16 }\nx = { from = 0.2, to = 0.8, steps = 4 }"), chunkSize: 16);
        foreach (var run in new[] { line, plane })
        {
            await Engine.Refinement.Refiner.RunAsync(run, 2, 1, null, CancellationToken.None);
            Assert.Equal(2, run.FinishedLevels());
            Assert.True(Directory.GetFiles(Path.Combine(run.LevelPath(2), "parts")).Length > 1, "a level has several parts");
        }

        foreach (var (run, request) in new[]
        {
            (line, new MapRequest(ColorMode.Regime, new Dictionary<string, double>(), 900, 600)),
            (line, new MapRequest(ColorMode.Period, new Dictionary<string, double>(), 900, 600)),
            (plane, new MapRequest(ColorMode.Regime, new Dictionary<string, double>())),
            (plane, new MapRequest(ColorMode.Period, new Dictionary<string, double>())),
            (plane, new MapRequest(ColorMode.Lyapunov, new Dictionary<string, double>())),
            (plane, new MapRequest(ColorMode.Regime, new Dictionary<string, double> { ["x"] = 0.41 }, 900, 600)),
        })
        {
            var samples = MapRenderer.DrawsSamples(run.LoadSpec().Grid, request);
            var levels = new List<RunTable>();
            for (var level = 1; level <= run.FinishedLevels(); level++)
            {
                levels.Add(await RunTable.ReadLevelAsync(run, level, samples));
            }

            var whole = MapRenderer.Render(run, await RunTable.ReadAsync(run, samples), request, "logistic", levels);
            Assert.Equal(whole, await MapRenderer.RenderStreamedAsync(run, request, "logistic"));
        }
    }

    // Attractor colours read part by part — one catalog labelling the parts in order — against the whole run labelled at
    // once: byte for byte, for a grid of starting points (each point's own row names its attractor) and for several
    // starts per point (the attractor table names them), as a map of two axes and as a bifurcation diagram's strip.
    [Fact]
    public async Task AttractorMap_ReadPartByPart_IsTheSamePicture()
    {
        const string a = "a = { from = 1.1, to = 2.2, steps = 12 }";
        var plane = await TestRuns.CreateAsync(Path.Combine(folder, "cubic-plane"), TestRuns.Cubic(a + "\nx = { from = -0.95, to = 0.95, steps = 20 }", "samples = 4"), chunkSize: 37);
        var starts = await TestRuns.CreateAsync(
            Path.Combine(folder, "cubic-starts"),
            TestRuns.Cubic(a, "samples = 4") + "\n[initial]\nx = 0.3\n[starts]\nx = { from = -1, to = 1, steps = 6 }\n",
            chunkSize: 3);
        foreach (var (run, request) in new[]
        {
            (plane, new MapRequest(ColorMode.Attractor, new Dictionary<string, double>())),
            (plane, new MapRequest(ColorMode.Attractor, new Dictionary<string, double> { ["x"] = 0.5 }, 900, 600)),
            (starts, new MapRequest(ColorMode.Attractor, new Dictionary<string, double>(), 900, 600)),
        })
        {
            Assert.True(Directory.GetFiles(run.PartsPath).Length > 2, "the runs have several parts");
            var samples = MapRenderer.DrawsSamples(run.LoadSpec().Grid, request);
            var whole = MapRenderer.Render(run, await RunTable.ReadAsync(run, samples, attractors: true), request, "cubic");
            Assert.Equal(whole, await MapRenderer.RenderStreamedAsync(run, request, "cubic"));
        }
    }

    [Fact]
    public void DrawsSamples_OnlyForABifurcationDiagram()
    {
        // Samples are read only when one axis is left free: two free axes make a regime map, which never reads them.
        var spec = Engine.Config.SpecReader.Parse(TestRuns.Logistic("r = { from = 2.6, to = 3.6, steps = 11 }\nx = { from = 0.2, to = 0.8, steps = 3 }"), "test.toml");
        Assert.False(MapRenderer.DrawsSamples(spec.Grid, new MapRequest(ColorMode.Regime, new Dictionary<string, double>())));
        Assert.True(MapRenderer.DrawsSamples(spec.Grid, new MapRequest(ColorMode.Regime, new Dictionary<string, double> { ["x"] = 0.5 })));
        var line = Engine.Config.SpecReader.Parse(TestRuns.Logistic("r = { from = 2.6, to = 3.6, steps = 11 }"), "test.toml");
        Assert.True(MapRenderer.DrawsSamples(line.Grid, new MapRequest(ColorMode.Period, new Dictionary<string, double>())));
    }

    private static void Tolerance(double expected, double actual) =>
        Assert.True(Math.Abs(expected - actual) <= 1e-9, $"expected {expected:R}, got {actual:R}");

    [Fact]
    public async Task Render_RefusesThreeFreeAxes_WithoutASlice()
    {
        var config = TestRuns.Logistic("r = { from = 3.0, to = 3.5, steps = 3 }\nx = { from = 0.2, to = 0.8, steps = 3 }").Replace("parameters = [\"r\"]", "parameters = [\"r\", \"h\"]")
            .Replace("r*x*(1 - x)", "r*x*(1 - x) - h*x").Replace("[grid]", "[grid]\nh = { from = 0.0, to = 0.1, steps = 2 }");
        var run = await TestRuns.CreateAsync(folder, config);
        var table = await RunTable.ReadAsync(run, samples: false);
        var error = Assert.Throws<ArgumentException>(() => MapRenderer.Build(run, table, new MapRequest(ColorMode.Regime, new Dictionary<string, double>()), "t"));
        Assert.Contains("choose a plane with --slice NAME=VALUE", error.Message);
        var sliced = MapRenderer.Build(run, table, new MapRequest(ColorMode.Regime, new Dictionary<string, double> { ["h"] = 0.1 }), "t");
        Assert.NotNull(sliced);
    }

    public void Dispose()
    {
        if (Directory.Exists(folder))
        {
            Directory.Delete(folder, recursive: true);
        }
    }

    private static SKBitmap Decode(byte[] png) => SKBitmap.Decode(png) ?? throw new InvalidOperationException("PNG did not decode");

    private static void AssertColor(SKBitmap bitmap, Pixel pixel, Color expected)
    {
        var actual = bitmap.GetPixel((int)pixel.X, (int)pixel.Y);
        Assert.True(
            Math.Abs(actual.Red - expected.R) <= 2 && Math.Abs(actual.Green - expected.G) <= 2 && Math.Abs(actual.Blue - expected.B) <= 2,
            $"pixel ({pixel.X}, {pixel.Y}) is {actual}, expected {expected.ToHex()}");
    }
}
