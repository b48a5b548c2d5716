using Sweeps.Core.Analysis;
using Sweeps.Core.Kernels;
using Sweeps.Engine.Config;
using Sweeps.Engine.Planning;

namespace Sweeps.Engine.Tests.Planning;

/// <summary>
/// The order in which the cost estimate times its sample points (any prefix must be spread over the grid), and how
/// long `run`'s quick estimate keeps the run waiting: what it times is the project's own rule (CostEstimate's budgets).
/// </summary>
public sealed class CostEstimateTests
{
    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    [InlineData(12)]
    [InlineData(64)]
    [InlineData(257)]
    public void SpreadOrder_VisitsEveryPositionOnceEndsFirst_WhenCounted(int count)
    {
        var order = CostEstimate.SpreadOrder(count).ToArray();

        Assert.Equal(Enumerable.Range(0, count), order.Order());
        Assert.Equal(0, order[0]);
        if (count > 1)
        {
            Assert.Equal(count - 1, order[1]);
        }
    }

    [Fact]
    public void SpreadOrder_LeavesNoGapOverTwiceEvenSpacing_WhenStoppedAfterAnyPrefix()
    {
        // Bit-reversed order (van der Corput, 1935) fills a range by halving its gaps; the ends first and the factor 2
        // for grids whose size is not a power of two are this class's choice, checked here for every size up to 300.
        for (var count = 2; count <= 300; count++)
        {
            var order = CostEstimate.SpreadOrder(count).ToArray();
            for (var m = 2; m <= count; m++)
            {
                var seen = order.Take(m).Order().ToArray();
                var gap = seen.Zip(seen.Skip(1), (a, b) => b - a).Max();
                Assert.True(gap <= 2.0 * (count - 1) / (m - 1), $"{count} points, {m} timed: a gap of {gap}");
            }
        }
    }

    [Fact]
    public void MeasureBlocks_TimesOneBlockAtEachOfTwoPlacesAfterOneWarmUpBlock_WhenQuickAndBlocksAreSlow()
    {
        // A block of slow flow points takes longer than the quick estimate's 10-ms budget: the run waits for the
        // kernels' first call and one block at each end of the grid, and no more.
        var block = new StandInBlock(TimeSpan.FromMilliseconds(25));
        var estimate = CostEstimate.MeasureBlocks(SpecReader.Parse(Config, "slow.toml"), block, quick: true);

        Assert.Equal(3, block.Calls);
        Assert.Equal(2 * StandInBlock.Lanes, estimate.SampledPoints);
        Assert.True(estimate.SecondsPerPoint >= 0.025 / StandInBlock.Lanes, $"{estimate.SecondsPerPoint} s a point");
    }

    [Fact]
    public void MeasureBlocks_WarmsUpOnOneBlock_WhenQuickAndBlocksAreFast()
    {
        // Instant blocks: one warm-up call, then at most eight timings at each of the four places.
        var block = new StandInBlock(TimeSpan.Zero);
        var estimate = CostEstimate.MeasureBlocks(SpecReader.Parse(Config, "fast.toml"), block, quick: true);

        Assert.InRange(block.Calls, 1 + 2, 1 + (4 * 8));
        Assert.InRange(estimate.SampledPoints, 2 * StandInBlock.Lanes, 4 * StandInBlock.Lanes);
    }

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
        r = { from = 2.5, to = 4.0, steps = 1000 }
        """;

    /// <summary>A block analyzer that takes a fixed time per block and counts its calls.</summary>
    private sealed class StandInBlock(TimeSpan perBlock) : IBlockAnalyzer
    {
        public const int Lanes = 4;

        public int Calls { get; private set; }

        public int BlockSize => Lanes;

        public IPointAnalyzer Scalar => throw new NotSupportedException();

        public void Analyze(double[][] initial, double[][] parameters, int count, PointResult[] results)
        {
            Calls++;
            if (perBlock > TimeSpan.Zero)
            {
                Thread.Sleep(perBlock);
            }
        }
    }
}
