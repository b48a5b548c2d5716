using System.Buffers;

namespace Sweeps.Engine.Runs.Columnar;

/// <summary>
/// Parquet's RLE / bit-packing hybrid, for definition and repetition levels and dictionary indices: a value repeated at
/// least eight times becomes one run (a varint header, the value once); everything between runs is bit-packed in groups
/// of eight. Only the last group may be padded (readers stop at the page's value count).
/// </summary>
internal static class HybridEncoder
{
    private const int Group = 8;

    /// <summary>
    /// Encodes <paramref name="values"/>; unless <paramref name="final"/>, only as far as needs no padding (the values
    /// left over, fewer than eight, go first in the next call). Returns how many values were encoded.
    /// </summary>
    public static int Encode(ReadOnlySpan<int> values, int width, IBufferWriter<byte> output, bool final = true)
    {
        var literalStart = 0;
        var i = 0;
        while (i < values.Length)
        {
            var value = values[i];
            var run = 1;
            while (i + run < values.Length && values[i + run] == value)
            {
                run++;
            }

            // The literals before a run must fill whole groups: the run lends them its first values when it can
            // spare them and still be eight long.
            var fill = (Group - ((i - literalStart) % Group)) % Group;
            if (run >= fill + Group)
            {
                i += fill;
                Literals(values[literalStart..i], width, output);
                Repeat(value, run - fill, width, output);
                i += run - fill;
                literalStart = i;
            }
            else
            {
                i += run;
            }
        }

        var tail = values.Length - literalStart;
        var encoded = final ? tail : tail - (tail % Group);
        Literals(values.Slice(literalStart, encoded), width, output);
        return literalStart + encoded;
    }

    private static void Repeat(int value, int count, int width, IBufferWriter<byte> output)
    {
        Varint.Write((ulong)count << 1, output);
        var bytes = (width + 7) / 8;
        var span = output.GetSpan(bytes);
        for (var b = 0; b < bytes; b++)
        {
            span[b] = (byte)(value >> (8 * b));
        }

        output.Advance(bytes);
    }

    private static void Literals(ReadOnlySpan<int> values, int width, IBufferWriter<byte> output)
    {
        if (values.IsEmpty)
        {
            return;
        }

        var groups = (values.Length + Group - 1) / Group;
        Varint.Write(((ulong)groups << 1) | 1, output);
        if (width > 8)
        {
            Span<ulong> wide = stackalloc ulong[Group];
            for (var g = 0; g < groups; g++)
            {
                wide.Clear();
                var slice = values.Slice(g * Group, Math.Min(Group, values.Length - (g * Group)));
                for (var k = 0; k < slice.Length; k++)
                {
                    wide[k] = (ulong)slice[k];
                }

                BitPacking.Pack(wide, width, output);
            }

            return;
        }

        // Levels and dictionary indices are a few bits wide: a group of eight fits one ulong, written as width bytes.
        var span = output.GetSpan(groups * width);
        var at = 0;
        for (var g = 0; g < groups; g++)
        {
            var slice = values.Slice(g * Group, Math.Min(Group, values.Length - (g * Group)));
            ulong packed = 0;
            for (var k = 0; k < slice.Length; k++)
            {
                packed |= (ulong)(uint)slice[k] << (k * width);
            }

            for (var b = 0; b < width; b++)
            {
                span[at++] = (byte)(packed >> (8 * b));
            }
        }

        output.Advance(at);
    }
}
