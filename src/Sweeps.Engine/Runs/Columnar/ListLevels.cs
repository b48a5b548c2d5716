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
            var levels = Math.Max(1, count);
            Row(repetitions.Slice(at, levels), count, repetition: true, first: true);
            Row(definitions.Slice(at, levels), count, repetition: false, first: true);
            at += levels;
        }
    }

    /// <summary>
    /// Hybrid-encodes the repetition (or definition) levels of the rows, made a block at a time: a chunk's levels are
    /// millions of integers, and a page of memory touched for the first time costs more than encoding it.
    /// </summary>
    public static void Encode(ReadOnlySpan<int> counts, bool repetition, IBufferWriter<byte> output)
    {
        const int Block = 1 << 14;
        var width = repetition ? 1 : 2;
        var buffer = ScratchPools.Ints.Rent(Block);
        try
        {
            var filled = 0;
            void Flush()
            {
                var encoded = HybridEncoder.Encode(buffer.AsSpan(0, filled), width, output, final: false);
                buffer.AsSpan(encoded, filled - encoded).CopyTo(buffer);
                filled -= encoded;
            }

            foreach (var count in counts)
            {
                // A row's levels at once when the block has room for them (any real sample count), else in pieces.
                var levels = Math.Max(1, count);
                if (filled + levels > buffer.Length)
                {
                    Flush();
                }

                for (var done = 0; done < levels;)
                {
                    if (filled == buffer.Length)
                    {
                        Flush();
                    }

                    var piece = Math.Min(levels - done, buffer.Length - filled);
                    Row(buffer.AsSpan(filled, piece), count, repetition, first: done == 0);
                    filled += piece;
                    done += piece;
                }
            }

            HybridEncoder.Encode(buffer.AsSpan(0, filled), width, output);
        }
        finally
        {
            ScratchPools.Ints.Return(buffer);
        }
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

    /// <summary>Levels of (part of) a row of <paramref name="count"/> values; <paramref name="first"/>: the part that starts the row.</summary>
    private static void Row(Span<int> levels, int count, bool repetition, bool first)
    {
        levels.Fill(repetition ? 1 : count == 0 ? 1 : 2);
        if (repetition && first)
        {
            levels[0] = 0;
        }
    }
}
