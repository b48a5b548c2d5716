using System.Buffers;

namespace Sweeps.Engine.Runs.Columnar;

/// <summary>Parquet's bit packing: values of a fixed bit width, least significant bit first, back to back.</summary>
internal static class BitPacking
{
    /// <summary>Packs <paramref name="values"/> (each below 2^<paramref name="width"/>) into <c>ceil(count · width / 8)</c> bytes.</summary>
    public static void Pack(ReadOnlySpan<ulong> values, int width, IBufferWriter<byte> output)
    {
        var bytes = ((values.Length * width) + 7) / 8;
        if (bytes == 0)
        {
            return;
        }

        var span = output.GetSpan(bytes);
        var written = 0;
        ulong buffer = 0;
        var bits = 0;
        foreach (var value in values)
        {
            // Up to 64 bits of a value and 7 left over do not fit one ulong: spill what overflows.
            buffer |= value << bits;
            var overflow = bits + width > 64 ? value >> (64 - bits) : 0;
            bits += width;
            while (bits >= 8)
            {
                span[written++] = (byte)buffer;
                buffer >>= 8;
                if (bits > 64)
                {
                    buffer |= overflow << (64 - 8);
                    overflow = 0;
                }

                bits -= 8;
            }
        }

        if (bits > 0)
        {
            span[written++] = (byte)buffer;
        }

        output.Advance(written);
    }

    /// <summary>The bits needed for every value up to <paramref name="max"/>.</summary>
    public static int Width(ulong max) => 64 - System.Numerics.BitOperations.LeadingZeroCount(max);
}
