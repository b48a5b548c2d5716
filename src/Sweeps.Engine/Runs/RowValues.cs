namespace Sweeps.Engine.Runs;

/// <summary>
/// A list of numbers per row, kept flat: every row's numbers one after another in <see cref="Values"/>, row i from
/// <see cref="Starts"/>[i] to <see cref="Starts"/>[i + 1]. Ten million rows of samples are two arrays this way, not ten
/// million (which cost seconds of allocation and collection to read, and twice the memory).
/// </summary>
public sealed class RowValues
{
    public RowValues(double[] values, int[] starts)
    {
        if (starts.Length == 0 || starts[0] != 0 || starts[^1] > values.Length)
        {
            throw new ArgumentException("row starts must begin at 0 and end within the values", nameof(starts));
        }

        (Values, Starts) = (values, starts);
    }

    /// <summary>All rows' numbers, row after row (the array may go on beyond the last row's end; see <see cref="All"/>).</summary>
    internal double[] Values { get; }

    /// <summary>All rows' numbers, row after row.</summary>
    public ReadOnlySpan<double> All => Values.AsSpan(0, Starts[^1]);

    /// <summary>Where each row starts in <see cref="Values"/>, and one more entry: where the last one ends.</summary>
    public int[] Starts { get; }

    public int Count => Starts.Length - 1;

    public ReadOnlySpan<double> this[int row] => Values.AsSpan(Starts[row], Starts[row + 1] - Starts[row]);

    /// <summary>The rows in the order <paramref name="order"/> gives (row k of the result is row order[k] of this).</summary>
    public RowValues Reorder(int[] order)
    {
        var values = new double[Starts[^1]];
        var starts = new int[order.Length + 1];
        for (var k = 0; k < order.Length; k++)
        {
            var row = this[order[k]];
            row.CopyTo(values.AsSpan(starts[k]));
            starts[k + 1] = starts[k] + row.Length;
        }

        return new RowValues(values, starts);
    }

    /// <summary>The rows of several lists one after another.</summary>
    public static RowValues Concat(IReadOnlyList<RowValues> lists)
    {
        var values = new double[lists.Sum(l => (long)l.Starts[^1])];
        var starts = new int[lists.Sum(l => l.Count) + 1];
        var (at, row) = (0, 0);
        foreach (var list in lists)
        {
            list.Values.AsSpan(0, list.Starts[^1]).CopyTo(values.AsSpan(at));
            for (var i = 1; i <= list.Count; i++)
            {
                starts[row + i] = at + list.Starts[i];
            }

            (at, row) = (at + list.Starts[^1], row + list.Count);
        }

        return new RowValues(values, starts);
    }

    /// <summary>Collects rows as they are read (part by part), growing its arrays as a list would.</summary>
    internal sealed class Builder(int rows = 1024, long capacity = 1024)
    {
        private double[] values = new double[Math.Max(1, capacity)];
        private int[] starts = new int[Math.Max(1, rows) + 1];

        public int Count { get; private set; }

        private int End => starts[Count];

        /// <summary>Appends a row of the values at <paramref name="first"/>, <paramref name="first"/> + stride, … (<paramref name="count"/> of them).</summary>
        public void Add(ReadOnlySpan<double> source, int first, int count, int stride)
        {
            if (End + count > values.Length)
            {
                Array.Resize(ref values, Math.Max(2 * values.Length, End + count));
            }

            if (Count + 2 > starts.Length)
            {
                Array.Resize(ref starts, 2 * starts.Length);
            }

            var end = End;
            for (var k = 0; k < count; k++)
            {
                values[end + k] = source[first + (k * stride)];
            }

            starts[Count + 1] = end + count;
            Count++;
        }

        /// <summary>The rows (the values array as it is, possibly longer than the rows use).</summary>
        public RowValues Build() => new(values, starts.Length == Count + 1 ? starts : starts[..(Count + 1)]);
    }
}
