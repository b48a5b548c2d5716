using Sweeps.Engine.Planning;

namespace Sweeps.Engine.Tests.Planning;

/// <summary>The order in which the cost estimate times its sample points: any prefix must be spread over the grid.</summary>
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
}
