using System.Buffers;

namespace Sweeps.Engine.Runs.Columnar;

/// <summary>
/// The Parquet levels of a list column that is never null, from and to the number of values in each row: repetition 0
/// starts a row and 1 continues it; definition 2 is a value, 1 an empty list (one level, no value).
/// </summary>
internal static class ListLevels
{
    /// <summary>How many levels the rows take: one per value, one for an empty row.</summary>
    public static int Count(ReadOnlySpan<int> counts)
    {
        var levels = 0;
        foreach (var count in counts)
        {
            levels += Math.Max(1, count);
        }

        return levels;
    }

    /// <summary>Writes the rows' levels (<see cref="Count"/> of each) into <paramref name="repetitions"/> and <paramref name="definitions"/>.</summary>
    public static void Fill(ReadOnlySpan<int> counts, Span<int> repetitions, Span<int> definitions)
    {
        var at = 0;
        foreach (var count in counts)
        {
            if (count == 0)
            {
                repetitions[at] = 0;
                definitions[at++] = 1;
                continue;
            }

            repetitions.Slice(at, count).Fill(1);
            repetitions[at] = 0;
            definitions.Slice(at, count).Fill(2);
            at += count;
        }
    }

    /// <summary>
    /// Writes the repetition (or definition) levels of the rows as a version-1 data page holds them — their byte length,
    /// then the hybrid encoding — made and encoded a block at a time: a chunk's levels are millions of integers, and a
    /// page of memory touched for the first time costs more than encoding it.
    /// </summary>
    public static void Encode(ReadOnlySpan<int> counts, bool repetition, PooledBuffer output)
    {
        const int Block = 1 << 14;
        var width = repetition ? 1 : 2;
        var at = output.WrittenCount;
        output.GetSpan(4);
        output.Advance(4);
        var buffer = ArrayPool<int>.Shared.Rent(Block);
        try
        {
            var filled = 0;
            foreach (var count in counts)
            {
                // A row's levels at once (a row longer than the block, which no real sample count is, level by level).
                var levels = Math.Max(1, count);
                if (filled + levels > buffer.Length)
                {
                    var encoded = HybridEncoder.Encode(buffer.AsSpan(0, filled), width, output, final: false);
                    buffer.AsSpan(encoded, filled - encoded).CopyTo(buffer);
                    filled -= encoded;
                }

                if (filled + levels <= buffer.Length)
                {
                    var row = buffer.AsSpan(filled, levels);
                    row.Fill(repetition ? 1 : count == 0 ? 1 : 2);
                    if (repetition)
                    {
                        row[0] = 0;
                    }

                    filled += levels;
                    continue;
                }

                for (var k = 0; k < levels; k++)
                {
                    if (filled == buffer.Length)
                    {
                        var encoded = HybridEncoder.Encode(buffer.AsSpan(0, filled), width, output, final: false);
                        buffer.AsSpan(encoded, filled - encoded).CopyTo(buffer);
                        filled -= encoded;
                    }

                    buffer[filled++] = repetition ? (k == 0 ? 0 : 1) : (count == 0 ? 1 : 2);
                }
            }

            HybridEncoder.Encode(buffer.AsSpan(0, filled), width, output);
        }
        finally
        {
            ArrayPool<int>.Shared.Return(buffer);
        }

        output.SetInt32(at, output.WrittenCount - at - 4);
    }

    /// <summary>The number of values in each row of levels read back; returns the number of rows.</summary>
    public static int Rows(ReadOnlySpan<int> repetitions, ReadOnlySpan<int> definitions, Span<int> counts)
    {
        var row = -1;
        for (var i = 0; i < repetitions.Length; i++)
        {
            if (repetitions[i] == 0)
            {
                counts[++row] = 0;
            }

            if (definitions[i] == 2)
            {
                counts[row]++;
            }
        }

        return row + 1;
    }
}
