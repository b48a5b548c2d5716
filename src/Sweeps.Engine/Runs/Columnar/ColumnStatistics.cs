using System.Numerics;
using System.Runtime.InteropServices;

namespace Sweeps.Engine.Runs.Columnar;

/// <summary>
/// What a column chunk's footer says about its values: the null count and, when there are values to order, the
/// smallest and largest in the type's own order (little-endian bytes; strings as UTF-8, compared byte by byte). Query
/// engines skip parts with these. NaN is left out of a double column's range (and a range of only NaN is not given);
/// a zero minimum is written as −0 and a zero maximum as +0, as the format asks.
/// </summary>
internal sealed record ColumnStatistics(long Nulls, byte[]? Min, byte[]? Max)
{
    /// <summary>An integer column's range.</summary>
    public static ColumnStatistics Of<T>(ReadOnlySpan<T> values)
        where T : unmanaged, IBinaryInteger<T>, IMinMaxValue<T>
    {
        if (values.IsEmpty)
        {
            return new ColumnStatistics(0, null, null);
        }

        var (min, max) = (T.MaxValue, T.MinValue);
        foreach (var value in values)
        {
            min = T.Min(min, value);
            max = T.Max(max, value);
        }

        return new ColumnStatistics(0, Bytes(min), Bytes(max));
    }

    public static ColumnStatistics Of(ReadOnlySpan<double> values, long nulls)
    {
        var (min, max) = (double.PositiveInfinity, double.NegativeInfinity);
        var ordered = false;
        foreach (var value in values)
        {
            // NaN fails both comparisons and so never moves the range.
            if (value < min)
            {
                min = value;
            }

            if (value > max)
            {
                max = value;
            }

            ordered |= !double.IsNaN(value);
        }

        if (!ordered)
        {
            return new ColumnStatistics(nulls, null, null);
        }

        min = min == 0 ? -0.0 : min;
        max = max == 0 ? 0.0 : max;
        return new ColumnStatistics(nulls, Bytes(min), Bytes(max));
    }

    public static ColumnStatistics Of(ReadOnlySpan<bool> values)
    {
        if (values.IsEmpty)
        {
            return new ColumnStatistics(0, null, null);
        }

        var (any, all) = (false, true);
        foreach (var value in values)
        {
            any |= value;
            all &= value;
        }

        return new ColumnStatistics(0, [(byte)(all ? 1 : 0)], [(byte)(any ? 1 : 0)]);
    }

    /// <summary>The range of a dictionary's entries (every entry is used by some row).</summary>
    public static ColumnStatistics Of(IReadOnlyList<byte[]> entries, long nulls)
    {
        var range = new Strings();
        foreach (var entry in entries)
        {
            range.Add(entry);
        }

        return range.Result() with { Nulls = nulls };
    }

    /// <summary>A value's little-endian bytes, as the statistics hold them.</summary>
    private static byte[] Bytes<T>(T value)
        where T : unmanaged => MemoryMarshal.AsBytes(new ReadOnlySpan<T>(in value)).ToArray();

    /// <summary>Accumulates the range and null count of a string column one value at a time.</summary>
    public sealed class Strings
    {
        private byte[]? min;
        private byte[]? max;
        private long nulls;

        public void Add(ReadOnlySpan<byte> value)
        {
            if (min is null || value.SequenceCompareTo(min) < 0)
            {
                min = value.ToArray();
            }

            if (max is null || value.SequenceCompareTo(max) > 0)
            {
                max = value.ToArray();
            }
        }

        public void AddNull() => nulls++;

        public ColumnStatistics Result() => new(nulls, min, max);
    }
}
