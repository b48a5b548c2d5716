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
        // 2.8 … 3.3 in 51 steps, chunks of 10: the partial run has chunks 0, 2 and 5 (30 + 1 points: the last chunk holds one).
        var whole = await TestRuns.CreateAsync(Path.Combine(folder, "whole"), TestRuns.Logistic("r = { from = 2.8, to = 3.3, steps = 51 }"), chunkSize: 10);
        var config = TestRuns.Logistic("r = { from = 2.8, to = 3.3, steps = 51 }");
        var spec = SpecReader.Parse(config, "test.toml");
        var (partial, _) = RunDirectory.CreateOrResume(Path.Combine(folder, "partial", "run"), spec, config, [], 10, TimeProvider.System);
        var context = new RunContext(partial);
        foreach (var chunk in new long[] { 0, 2, 5 })
        {
            await ChunkRunner.RunAsync(context, chunk, null, CancellationToken.None);
        }

        var diff = await RunDiff.CompareAsync(whole, partial, CancellationToken.None);
        Assert.Equal(21, diff.Compared);
        Assert.Equal(51 - 21, diff.OnlyInOne);

        // The same spec: every point both hold agrees bit for bit; the missing ones alone make it a change.
        Assert.Equal(0, diff.RegimeChanged + diff.PeriodChanged + diff.ExponentShifted);
        Assert.Empty(diff.ChangedRows);
        Assert.False(diff.NoChange);

        // A rough run of the same grid (3 + 64 iterations, chunks of 7): where its classes differ, the diff says so row by row.
        var roughConfig = TestRuns.Logistic("r = { from = 2.8, to = 3.3, steps = 51 }").Replace("transient = 2000", "transient = 3", StringComparison.Ordinal).Replace("measure = 1000", "measure = 64", StringComparison.Ordinal);
        var rough = await TestRuns.CreateAsync(Path.Combine(folder, "rough"), roughConfig, chunkSize: 7);
        var changes = await RunDiff.CompareAsync(whole, rough, CancellationToken.None);
        Assert.Equal(51, changes.Compared);
        Assert.NotEmpty(changes.ChangedRows);
        Assert.All(changes.ChangedRows.Zip(changes.ChangedBeforeRows), pair => Assert.Equal(changes.After.Point[pair.First], changes.Before.Point[pair.Second]));
        Assert.All(Enumerable.Range(0, 51), row => Assert.Equal(
            changes.Before.Regime[row] != changes.After.Regime[row] ? 2 : changes.Before.Period[row] != changes.After.Period[row] ? 1 : 0,
            changes.Change[row]));

        var plot = DiffRenderer.Build(whole, changes, new Dictionary<string, double>(), "changes");
        using var image = SkiaSharp.SKBitmap.Decode(plot.GetImageBytes(1000, 700, ImageFormat.Png));
        var changedRow = changes.ChangedRows[0];
        var at = plot.GetPixel(new Coordinates(changes.After.Axes[0][changedRow], 0.5));
        var pixel = image.GetPixel((int)at.X, (int)at.Y);
        var expected = changes.Change[changedRow] == 2 ? DiffRenderer.RegimeChanged : DiffRenderer.PeriodChanged;
        Assert.Equal((expected.R, expected.G, expected.B), (pixel.Red, pixel.Green, pixel.Blue));
    }

    public void Dispose()
    {
        if (Directory.Exists(folder))
        {
            Directory.Delete(folder, recursive: true);
        }
    }
}
