using System.Buffers;

namespace Sweeps.Engine.Runs.Columnar;

/// <summary>Unsigned LEB128 varints, seven bits a byte, as Thrift's compact protocol and Parquet's encodings use them.</summary>
internal static class Varint
{
    public static void Write(ulong value, IBufferWriter<byte> output)
    {
        var span = output.GetSpan(10);
        var length = 0;
        while (value >= 0x80)
        {
            span[length++] = (byte)(value | 0x80);
            value >>= 7;
        }

        span[length++] = (byte)value;
        output.Advance(length);
    }

    public static ulong ZigZag(long value) => (ulong)((value << 1) ^ (value >> 63));
}
