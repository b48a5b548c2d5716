using Sweeps.Engine.Config;
using Sweeps.Engine.Execution;
using Sweeps.Engine.Runs;

namespace Sweeps.Engine.Tests.Runs;

/// <summary>
/// A run's summary taken from the counts its own process kept of the parts it wrote is the summary read from the parts'
/// footers — also for a run resumed by a second process, whose summary mixes both.
/// </summary>
public sealed class RunSummaryTests
{
    // Common practice: the logistic map's fixed point (r < 3), its 2-cycle and beyond, chaos past r ≈ 3.57, and
    // escapes past r = 4 — every kind of count a part keeps.
    private const string Config = """
        [model]
        kind = "map"
        variables = ["x"]
        parameters = ["r"]
        [model.equations]
        x = "r*x*(1 - x)"
        [initial]
        x = 0.3
        [grid]
        r = { from = 2.8, to = 4.2, steps = 701 }
        [analysis]
        transient = 300
        measure = 300
        lyapunov = "largest"
        max_period = 16
        samples = 2
        """;

    [Fact]
    public async Task CountsKeptByTheWritingProcess_GiveTheSummaryOfTheFooters()
    {
        using var folder = TestRunDirectories.Folder("summary");
        var run = TestRunDirectories.Create(folder, Config, chunkSize: 100);
        var first = await TestRunDirectories.ComputeAsync(run, run.MissingChunks().Take(3));

        // Unfinished: the first process's counts against the footers.
        Same(await RunSummary.ReadAsync(run), await RunSummary.ReadAsync(first));

        // Resumed by a second process, which knows only its own parts.
        var second = await TestRunDirectories.ComputeAsync(run);
        var fromFooters = await RunSummary.ReadAsync(run);
        Assert.Equal(701, fromFooters.PointsDone);
        Assert.True(fromFooters.Regimes.Count >= 3, string.Join(", ", fromFooters.Regimes.Keys));
        Same(fromFooters, await RunSummary.ReadAsync(second));
    }

    [Fact]
    public async Task PartsWrittenByTheProcess_AreNotOpenedAgain()
    {
        using var folder = TestRunDirectories.Folder("summary");
        var run = TestRunDirectories.Create(folder, Config, chunkSize: 400);
        var context = await TestRunDirectories.ComputeAsync(run);

        // A part spoilt after it was written: its footer can no longer be read, but the writing process kept its counts.
        File.WriteAllBytes(run.PartPath(1), [1, 2, 3]);
        Assert.Equal(701, (await RunSummary.ReadAsync(context)).PointsDone);
        await Assert.ThrowsAnyAsync<Exception>(() => RunSummary.ReadAsync(run));
    }

    private static void Same(RunSummary expected, RunSummary actual)
    {
        Assert.Equal(expected.PointsDone, actual.PointsDone);
        Assert.Equal(expected.ChunksDone, actual.ChunksDone);
        Assert.Equal(expected.MissingChunks, actual.MissingChunks);
        Assert.Equal(expected.Regimes.OrderBy(r => r.Key, StringComparer.Ordinal), actual.Regimes.OrderBy(r => r.Key, StringComparer.Ordinal));
        Assert.Equal(expected.Periods.OrderBy(p => p.Key), actual.Periods.OrderBy(p => p.Key));
        Assert.Equal(BitConverter.DoubleToInt64Bits(expected.LargestExponentMin), BitConverter.DoubleToInt64Bits(actual.LargestExponentMin));
        Assert.Equal(BitConverter.DoubleToInt64Bits(expected.LargestExponentMax), BitConverter.DoubleToInt64Bits(actual.LargestExponentMax));
        Assert.Equal(expected.State, actual.State);
        Assert.Equal(expected.MultistablePoints, actual.MultistablePoints);
        Assert.Equal(expected.HysteresisPoints, actual.HysteresisPoints);
    }
}
