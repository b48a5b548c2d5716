using Sweeps.Cli.Output;
using Sweeps.Engine.Runs;

namespace Sweeps.Cli.Tests;

/// <summary>The summary lines `run` and `inspect` end with.</summary>
public sealed class SummaryTextTests
{
    [Fact]
    public void Regimes_ListsTheLargestCountFirst_AndTiesByName()
    {
        var summary = Summary(new Dictionary<string, long> { ["periodic"] = 1200, ["chaotic"] = 40_000, ["fixed point"] = 1200, ["divergent"] = 3 }, []);
        Assert.Equal("chaotic 40,000  fixed point 1,200  periodic 1,200  divergent 3", SummaryText.Regimes(summary));
        Assert.Equal("none yet", SummaryText.Regimes(Summary([], [])));
    }

    [Fact]
    public void Periods_ListsTheFirstSixteen_InTheSummarysOrder()
    {
        var periods = new SortedDictionary<int, long>();
        for (var period = 1; period <= 20; period++)
        {
            periods[period] = 1000L * period;
        }

        var text = SummaryText.Periods(Summary([], periods));
        Assert.StartsWith("1: 1,000  2: 2,000  3: 3,000", text);
        Assert.EndsWith("16: 16,000  …", text);
        Assert.Equal("none", SummaryText.Periods(Summary([], [])));
        Assert.Equal("2: 5", SummaryText.Periods(Summary([], new SortedDictionary<int, long> { [2] = 5 })));
    }

    private static RunSummary Summary(Dictionary<string, long> regimes, SortedDictionary<int, long> periods) =>
        new(1, 1, 1, 1, [], regimes, periods, double.NaN, double.NaN, RunManifest.Complete);
}
