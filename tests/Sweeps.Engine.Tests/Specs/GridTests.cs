using CsCheck;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Tests.Specs;

public sealed class GridTests
{
    [Fact]
    public void ValueAt_HitsBothEnds_ForLinearAndLogAxes()
    {
        var linear = new GridAxis("a", AxisTarget.Parameter, 0, 0.1, 0.7, 7);
        Assert.Equal(0.1, linear.ValueAt(0));
        Assert.Equal(0.7, linear.ValueAt(6));
        Assert.Equal(0.4, linear.ValueAt(3), 15);

        // Common practice: logarithmic spacing has a constant ratio between neighbours.
        var log = new GridAxis("k", AxisTarget.Parameter, 0, 1e-3, 1e3, 7, AxisSpacing.Log);
        Assert.Equal(1e-3, log.ValueAt(0));
        Assert.Equal(1e3, log.ValueAt(6));
        Assert.Equal(1.0, log.ValueAt(3), 12);
    }

    [Fact]
    public void PointIndex_InvertsIndices_ForRandomGrids()
    {
        var shapes = Gen.Long[1, 1000].Array[1, 4];
        Gen.Select(shapes, Gen.Double[0, 1]).Sample((shape, fraction) =>
        {
            var grid = new Grid(shape.Select((count, i) => new GridAxis($"p{i}", AxisTarget.Parameter, i, 0, 1, count)).ToArray());
            var point = (long)(fraction * (grid.PointCount - 1));
            var indices = new long[shape.Length];
            grid.Indices(point, indices);
            return grid.PointIndex(indices) == point && indices.Select((v, i) => v < shape[i]).All(ok => ok);
        });
    }

    [Fact]
    public void LineOrder_InvertsLinePoint_ForRandomGridsAndFollowedAxes()
    {
        // Walking the lines in order, step by step, visits every point once: line × length + step (an exact identity).
        Gen.Select(Gen.Int[1, 5].Array[1, 4], Gen.Int[0, 3]).Sample((shape, follow) =>
        {
            var grid = new Grid(shape.Select((count, i) => new GridAxis($"p{i}", AxisTarget.Parameter, i, 0, 1, count)).ToArray(), follow % shape.Length);
            var seen = new HashSet<long>();
            for (var line = 0L; line < grid.LineCount; line++)
            {
                for (var step = 0L; step < grid.LineLength; step++)
                {
                    var point = grid.LinePoint(line, step);
                    Assert.True(seen.Add(point));
                    Assert.Equal((line * grid.LineLength) + step, grid.LineOrder(point));
                }
            }

            Assert.Equal(grid.PointCount, seen.Count);
        });
    }

    [Fact]
    public void Indices_AreRowMajor_LastAxisFastest()
    {
        var grid = new Grid([new GridAxis("a", AxisTarget.Parameter, 0, 0, 1, 3), new GridAxis("b", AxisTarget.Parameter, 1, 0, 1, 4)]);
        var indices = new long[2];
        grid.Indices(5, indices);
        Assert.Equal([1L, 1L], indices);
    }

    [Fact]
    public void PointCount_IsExact_ForAGridOfABillionPoints()
    {
        var axes = Enumerable.Range(0, 3).Select(i => new GridAxis($"p{i}", AxisTarget.Parameter, i, 0, 1, 1000)).ToArray();
        var grid = new Grid(axes);
        Assert.Equal(1_000_000_000, grid.PointCount);
        var parameters = new double[3];
        grid.Apply(grid.PointCount - 1, new double[0], parameters);
        Assert.Equal([1.0, 1.0, 1.0], parameters);
    }

    // Exact (combinatorics): the lines along a followed axis cover every point exactly once, each line varies
    // only that axis, in order, and keeps every other coordinate.
    [Fact]
    public void LinePoint_PartitionsTheGridIntoLinesAlongTheFollowedAxis()
    {
        var shapes = Gen.Long[1, 7].Array[1, 4];
        Gen.Select(shapes, Gen.Int[0, 3]).Sample((shape, pick) =>
        {
            var follow = pick % shape.Length;
            var grid = new Grid(shape.Select((count, i) => new GridAxis($"p{i}", AxisTarget.Parameter, i, 0, 1, count)).ToArray(), follow);
            var seen = new HashSet<long>();
            var indices = new long[shape.Length];
            var first = new long[shape.Length];
            for (var line = 0L; line < grid.LineCount; line++)
            {
                grid.Indices(grid.LinePoint(line, 0), first);
                for (var step = 0L; step < grid.LineLength; step++)
                {
                    var point = grid.LinePoint(line, step);
                    Assert.True(seen.Add(point));
                    grid.Indices(point, indices);
                    Assert.Equal(step, indices[follow]);
                    Assert.All(Enumerable.Range(0, shape.Length).Where(a => a != follow), a => Assert.Equal(first[a], indices[a]));
                }
            }

            Assert.Equal(grid.PointCount, seen.Count);
        });
    }
}
