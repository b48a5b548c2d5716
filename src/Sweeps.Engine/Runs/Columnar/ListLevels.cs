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
            Row(repetitions.Slice(at, levels), count, repetition: true);
            Row(definitions.Slice(at, levels), count, repetition: false);
            at += levels;
        }
    }

    /// <summary>
    /// Hybrid-encodes the repetition (or definition) levels of the rows as runs (<see cref="LevelRuns"/>): a row of
    /// values is a repetition 0 and then 1s, and definition 2 for each value; an empty row one level, 0 and 1.
    /// </summary>
    public static void Encode(ReadOnlySpan<int> counts, bool repetition, IBufferWriter<byte> output)
    {
        using var runs = new LevelRuns(repetition ? 1 : 2, output);
        foreach (var count in counts)
        {
            if (repetition)
            {
                runs.Add(0, 1);
                runs.Add(1, count - 1);
            }
            else
            {
                runs.Add(count == 0 ? 1 : 2, Math.Max(1, count));
            }
        }

        runs.Finish();
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

    /// <summary>The levels of a row of <paramref name="count"/> values.</summary>
    private static void Row(Span<int> levels, int count, bool repetition)
    {
        levels.Fill(repetition ? 1 : count == 0 ? 1 : 2);
        if (repetition)
        {
            levels[0] = 0;
        }
    }
}
