using System.Buffers;

namespace Sweeps.Engine.Runs.Columnar;

/// <summary>
/// Parquet's DELTA_BINARY_PACKED encoding of 64-bit integers: blocks of 128 differences, each block stored as its
/// smallest difference and four miniblocks of 32 bit-packed offsets from it. The point index of a part rises by one
/// at every row, so its blocks pack to zero bits: a few hundred bytes for a whole part.
/// </summary>
internal static class DeltaEncoder
{
    private const int BlockSize = 128;
    private const int Miniblocks = 4;
    private const int MiniblockSize = BlockSize / Miniblocks;

    public static void Encode(ReadOnlySpan<long> values, IBufferWriter<byte> output)
    {
        Varint.Write(BlockSize, output);
        Varint.Write(Miniblocks, output);
        Varint.Write((ulong)values.Length, output);
        Varint.Write(Varint.ZigZag(values.IsEmpty ? 0 : values[0]), output);
        Span<ulong> offsets = stackalloc ulong[BlockSize];
        Span<byte> widths = stackalloc byte[Miniblocks];
        for (var start = 1; start < values.Length; start += BlockSize)
        {
            var count = Math.Min(BlockSize, values.Length - start);

            // Differences wrap around in two's complement, as the format prescribes for overflowing ones.
            var min = long.MaxValue;
            for (var k = 0; k < count; k++)
            {
                min = Math.Min(min, unchecked(values[start + k] - values[start + k - 1]));
            }

            offsets.Clear();
            for (var k = 0; k < count; k++)
            {
                offsets[k] = unchecked((ulong)(values[start + k] - values[start + k - 1] - min));
            }

            Varint.Write(Varint.ZigZag(min), output);
            var used = (count + MiniblockSize - 1) / MiniblockSize;
            widths.Clear();
            for (var m = 0; m < used; m++)
            {
                var max = 0UL;
                foreach (var offset in offsets.Slice(m * MiniblockSize, MiniblockSize))
                {
                    max |= offset;
                }

                widths[m] = (byte)BitPacking.Width(max);
            }

            output.Write(widths);

            // Miniblocks past the last value are not written; the last one written is padded with zeros.
            for (var m = 0; m < used; m++)
            {
                BitPacking.Pack(offsets.Slice(m * MiniblockSize, MiniblockSize), widths[m], output);
            }
        }
    }
}
