using ScottPlot;
using Sweeps.Engine.Config;
using Sweeps.Engine.Execution;
using Sweeps.Engine.Runs;

namespace Sweeps.Maps.Tests;

/// <summary>
/// Two runs of one grid compared point by point when one of them is unfinished: only the points both hold are compared,
/// the others are counted as in one run only, and the picture shows the changed ones where they are. Exact: the
/// logistic family's fixed point is stable for r &lt; 3 and its 2-cycle for 3 &lt; r &lt; 1 + √6, whatever the start in (0, 1).
/// </summary>
public sealed class DiffRendererTests : IDisposable
{
    private readonly string folder = Path.Combine(Path.GetTempPath(), "sweeps-diff-" + Guid.NewGuid().ToString("N")[..10]);

    [Fact]
    public async Task Diff_ComparesOnlyThePointsBothRunsHold_AndDrawsTheChanges()
    {
        // 2.8 … 3.3 in 51 steps, chunks of 10: the partial run has chunks 0, 2 and 3 (30 points) — a gap, and nothing of
        // the whole run's last 11 points.
        var whole = await TestRuns.CreateAsync(Path.Combine(folder, "whole"), TestRuns.Logistic("r = { from = 2.8, to = 3.3, steps = 51 }"), chunkSize: 10);
        var config = TestRuns.Logistic("r = { from = 2.8, to = 3.3, steps = 51 }");
        var spec = SpecReader.Parse(config, "test.toml");
        var (partial, _) = RunDirectory.CreateOrResume(Path.Combine(folder, "partial", "run"), spec, config, [], 10, TimeProvider.System);
        var context = new RunContext(partial);
        foreach (var chunk in new long[] { 0, 2, 3 })
        {
            await ChunkRunner.RunAsync(context, chunk, null, CancellationToken.None);
        }

        var diff = await RunDiff.CompareAsync(whole, partial, token: CancellationToken.None);
        Assert.Equal(30, diff.Compared);
        Assert.Equal(51 - 30, diff.OnlyInOne);

        // The same spec: every point both hold agrees bit for bit; the missing ones alone make it a change.
        Assert.Equal(0, diff.RegimeChanged + diff.PeriodChanged + diff.ExponentShifted);
        Assert.Equal(0, diff.Changed.Count);
        Assert.False(diff.NoChange);

        // A rough run of the same grid (3 + 64 iterations, chunks of 7): where its classes differ, the diff says so row by row.
        var roughConfig = TestRuns.Logistic("r = { from = 2.8, to = 3.3, steps = 51 }").Replace("transient = 2000", "transient = 3", StringComparison.Ordinal).Replace("measure = 1000", "measure = 64", StringComparison.Ordinal);
        var rough = await TestRuns.CreateAsync(Path.Combine(folder, "rough"), roughConfig, chunkSize: 7);
        var picture = new DiffRenderer(whole.LoadSpec().Grid, new Dictionary<string, double>());
        var codes = new Dictionary<long, byte>();
        var changes = await RunDiff.CompareAsync(whole, rough, (part, code) =>
        {
            picture.Add(part, code);
            for (var row = 0; row < part.Count; row++)
            {
                codes[part.Point[row]] = code[row];
            }
        });
        Assert.Equal(51, changes.Compared);
        Assert.NotEqual(0, changes.Changed.Count);

        // Against the two runs read whole, independently of the walk: every point's code, and the changed points' values.
        var (before, after) = (await RunTable.ReadAsync(whole, samples: false), await RunTable.ReadAsync(rough, samples: false));
        Assert.All(Enumerable.Range(0, 51), row => Assert.Equal(
            before.Regime[row] != after.Regime[row] ? RunDiff.Regime : before.Period[row] != after.Period[row] ? RunDiff.PeriodOnly : RunDiff.Unchanged,
            codes[after.Point[row]]));
        var changedRows = Enumerable.Range(0, 51).Where(row => codes[after.Point[row]] != RunDiff.Unchanged).ToArray();
        Assert.Equal(changedRows.Select(r => after.Point[r]), changes.Changed.Point);
        Assert.Equal(changedRows.Select(r => before.Regime[r]), changes.Changed.RegimeBefore);
        Assert.Equal(changedRows.Select(r => after.Period[r]), changes.Changed.PeriodAfter);

        var plot = picture.Build(changes, "changes");
        using var image = SkiaSharp.SKBitmap.Decode(plot.GetImageBytes(1000, 700, ImageFormat.Png));
        var changedRow = changedRows[0];
        var at = plot.GetPixel(new Coordinates(after.Axes[0][changedRow], 0.5));
        var pixel = image.GetPixel((int)at.X, (int)at.Y);
        var expected = codes[after.Point[changedRow]] == RunDiff.Regime ? DiffRenderer.RegimeChanged : DiffRenderer.PeriodChanged;
        Assert.Equal((expected.R, expected.G, expected.B), (pixel.Red, pixel.Green, pixel.Blue));
    }

    // Continuation sweeps hold whole lines per part; with the followed axis slowest, a line's points lie three apart, so
    // the parts of two runs chunked differently interleave in point order. Walked line by line, the diff must find what
    // the two runs read whole and matched point by point find: the same points compared and in one run only, every
    // point's change code, and the changed points in point order.
    [Fact]
    public async Task Diff_OfContinuationSweeps_MatchesThePointsOfTwoWholeRuns()
    {
        const string grid = "r = { from = 2.8, to = 3.6, steps = 21 }\nx = { values = [0.2, 0.5, 0.8] }\nfollow = \"r\"";
        var coarse = await TestRuns.CreateAsync(Path.Combine(folder, "lines"), TestRuns.Logistic(grid), chunkSize: 21);
        var roughConfig = TestRuns.Logistic(grid).Replace("transient = 2000", "transient = 3", StringComparison.Ordinal).Replace("measure = 1000", "measure = 64", StringComparison.Ordinal);
        var spec = SpecReader.Parse(roughConfig, "test.toml");
        var (rough, _) = RunDirectory.CreateOrResume(Path.Combine(folder, "rough-lines", "run"), spec, roughConfig, [], 42, TimeProvider.System);
        var context = new RunContext(rough);
        await ChunkRunner.RunAsync(context, 1, null, CancellationToken.None); // the third line only
        var complete = await TestRuns.CreateAsync(Path.Combine(folder, "rough-all"), roughConfig, chunkSize: 42);

        foreach (var other in new[] { rough, complete })
        {
            var codes = new Dictionary<long, byte>();
            var diff = await RunDiff.CompareAsync(coarse, other, (part, code) =>
            {
                for (var row = 0; row < part.Count; row++)
                {
                    codes[part.Point[row]] = code[row];
                }
            });

            var before = await RunTable.ReadAsync(coarse, samples: false);
            var after = await RunTable.ReadAsync(other, samples: false);
            var rowOf = Enumerable.Range(0, before.Count).ToDictionary(row => before.Point[row]);
            var both = Enumerable.Range(0, after.Count).Where(row => rowOf.ContainsKey(after.Point[row])).ToArray();
            Assert.Equal(both.Length, diff.Compared);
            Assert.Equal(before.Count + after.Count - (2 * both.Length), diff.OnlyInOne);
            byte Code(int row) => before.Regime[rowOf[after.Point[row]]] != after.Regime[row] ? RunDiff.Regime
                : before.Period[rowOf[after.Point[row]]] != after.Period[row] ? RunDiff.PeriodOnly : RunDiff.Unchanged;
            Assert.All(both, row => Assert.Equal(Code(row), codes[after.Point[row]]));
            var changed = both.Where(row => Code(row) != RunDiff.Unchanged).ToArray();
            Assert.NotEmpty(changed);
            Assert.Equal(changed.Select(row => after.Point[row]), diff.Changed.Point);
            Assert.Equal(changed.Select(row => before.Regime[rowOf[after.Point[row]]]), diff.Changed.RegimeBefore);
            Assert.Equal(changed.Select(row => after.Period[row]), diff.Changed.PeriodAfter);
            Assert.Equal(changed.Select(row => after.Axes[1][row]), diff.Changed.Axes[1]);
        }
    }

    public void Dispose()
    {
        if (Directory.Exists(folder))
        {
            Directory.Delete(folder, recursive: true);
        }
    }
}
