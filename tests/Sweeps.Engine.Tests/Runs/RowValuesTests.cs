using Sweeps.Engine.Runs;

namespace Sweeps.Engine.Tests.Runs;

/// <summary>Rows of numbers kept flat: what goes in comes out row by row, reordered and joined; values by hand.</summary>
public sealed class RowValuesTests
{
    [Fact]
    public void Builder_KeepsEveryStridethValue_RowByRow_IncludingEmptyRows()
    {
        // States of two variables, row-major: the first variable's values are at even positions.
        double[] states = [1, 10, 2, 20, 3, 30, 4, 40];
        var builder = new RowValues.Builder();
        builder.Add(states, 0, 2, 2);   // 1, 2
        builder.Add(states, 4, 0, 2);   // an empty list
        builder.Add(states, 4, 2, 2);   // 3, 4
        for (var i = 0; i < 3000; i++)
        {
            builder.Add(states, 2, 1, 2); // 2 — enough rows to make the arrays grow
        }

        var rows = builder.Build();
        Assert.Equal(3003, rows.Count);
        Assert.Equal([1.0, 2.0], rows[0].ToArray());
        Assert.True(rows[1].IsEmpty);
        Assert.Equal([3.0, 4.0], rows[2].ToArray());
        Assert.All(Enumerable.Range(3, 3000), r => Assert.Equal([2.0], rows[r].ToArray()));
        Assert.Equal(4 + 3000, rows.All.Length);
    }

    [Fact]
    public void ReorderAndConcat_MoveWholeRows()
    {
        var a = new RowValues([1, 2, 3], [0, 2, 2, 3]);    // [1, 2], [], [3]
        var b = new RowValues([7, 8, 9, 0], [0, 1, 3]);    // [7], [8, 9] (the trailing 0 is not a row's)
        var reordered = a.Reorder([2, 0, 1]);
        Assert.Equal([3.0], reordered[0].ToArray());
        Assert.Equal([1.0, 2.0], reordered[1].ToArray());
        Assert.True(reordered[2].IsEmpty);

        var joined = RowValues.Concat([a, b]);
        Assert.Equal(5, joined.Count);
        Assert.Equal([[1.0, 2.0], [], [3.0], [7.0], [8.0, 9.0]], Enumerable.Range(0, 5).Select(r => joined[r].ToArray()));
        Assert.Throws<ArgumentException>(() => new RowValues([1], [1, 1]));
    }
}
