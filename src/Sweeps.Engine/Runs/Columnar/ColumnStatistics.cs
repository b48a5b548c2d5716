using System.Numerics;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

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

        // Four lanes at a time, each lane the loop below (a NaN fails both comparisons and so never moves the range); the
        // lanes then meet in that loop's order. Only equal values of different bits (±0) could come out otherwise, and
        // the zero's sign is fixed at the end. A column's statistics had cost 1.5 % of a map sweep (the samples' values).
        var vectors = Vector256.IsHardwareAccelerated ? values.Length / Vector256<double>.Count : 0;
        if (vectors > 0)
        {
            var (low, high) = (Vector256.Create(double.PositiveInfinity), Vector256.Create(double.NegativeInfinity));
            var seen = Vector256<double>.Zero;
            ref var first = ref MemoryMarshal.GetReference(values);
            for (var k = 0; k < vectors; k++)
            {
                var value = Vector256.LoadUnsafe(ref first, (nuint)(k * Vector256<double>.Count));
                low = Vector256.ConditionalSelect(Vector256.LessThan(value, low), value, low);
                high = Vector256.ConditionalSelect(Vector256.GreaterThan(value, high), value, high);
                seen |= Vector256.Equals(value, value);
            }

            for (var lane = 0; lane < Vector256<double>.Count; lane++)
            {
                min = low[lane] < min ? low[lane] : min;
                max = high[lane] > max ? high[lane] : max;
            }

            ordered = seen != Vector256<double>.Zero;
            values = values[(vectors * Vector256<double>.Count)..];
        }

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
