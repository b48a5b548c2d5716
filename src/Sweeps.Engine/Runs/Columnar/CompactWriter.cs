using System.Buffers;
using System.Text;

namespace Sweeps.Engine.Runs.Columnar;

/// <summary>
/// The writing half of Thrift's compact protocol, as far as Parquet's page headers and file footer need it: structs,
/// lists, 8/32/64-bit integers, booleans and binary. Field ids are written as deltas from the previous field of the
/// same struct (one byte when the delta is 1–15), integers as zigzag varints.
/// </summary>
internal sealed class CompactWriter(IBufferWriter<byte> output)
{
    private const byte BooleanTrue = 1;
    private const byte BooleanFalse = 2;
    private const byte Byte = 3;
    private const byte I32Type = 5;
    private const byte I64Type = 6;
    private const byte BinaryType = 8;
    private const byte ListType = 9;
    private const byte StructType = 12;

    private readonly Stack<short> enclosing = new();
    private short last;

    /// <summary>The element types a list can hold here.</summary>
    public enum Element : byte
    {
        I32 = I32Type,
        Binary = BinaryType,
        Struct = StructType,
    }

    /// <summary>Opens a struct that is the message itself or an element of a list (no field header).</summary>
    public void BeginStruct()
    {
        enclosing.Push(last);
        last = 0;
    }

    /// <summary>Opens a struct-valued field.</summary>
    public void BeginStruct(short id)
    {
        Field(id, StructType);
        BeginStruct();
    }

    public void EndStruct()
    {
        Raw(0);
        last = enclosing.Pop();
    }

    /// <summary>An empty struct as a field: how Thrift unions of marker types (a string, a list) are spelled.</summary>
    public void EmptyStruct(short id)
    {
        BeginStruct(id);
        EndStruct();
    }

    public void I8(short id, sbyte value)
    {
        Field(id, Byte);
        Raw((byte)value);
    }

    public void I32(short id, int value)
    {
        Field(id, I32Type);
        Varint.Write(Varint.ZigZag(value), output);
    }

    public void I64(short id, long value)
    {
        Field(id, I64Type);
        Varint.Write(Varint.ZigZag(value), output);
    }

    public void Bool(short id, bool value) => Field(id, value ? BooleanTrue : BooleanFalse);

    public void Binary(short id, ReadOnlySpan<byte> value)
    {
        Field(id, BinaryType);
        BinaryValue(value);
    }

    public void String(short id, string value)
    {
        Field(id, BinaryType);
        StringValue(value);
    }

    /// <summary>Opens a list field; its elements follow (<see cref="I32Value"/>, <see cref="StringValue"/>, <see cref="BeginStruct()"/>).</summary>
    public void List(short id, Element element, int count)
    {
        Field(id, ListType);
        if (count < 15)
        {
            Raw((byte)((count << 4) | (byte)element));
        }
        else
        {
            Raw((byte)(0xF0 | (byte)element));
            Varint.Write((uint)count, output);
        }
    }

    public void I32Value(int value) => Varint.Write(Varint.ZigZag(value), output);

    public void StringValue(string value)
    {
        var length = Encoding.UTF8.GetByteCount(value);
        Varint.Write((uint)length, output);
        var span = output.GetSpan(length);
        Encoding.UTF8.GetBytes(value, span);
        output.Advance(length);
    }

    private void BinaryValue(ReadOnlySpan<byte> value)
    {
        Varint.Write((uint)value.Length, output);
        output.Write(value);
    }

    private void Field(short id, byte type)
    {
        var delta = id - last;
        if (delta is > 0 and <= 15)
        {
            Raw((byte)((delta << 4) | type));
        }
        else
        {
            Raw(type);
            Varint.Write(Varint.ZigZag(id), output);
        }

        last = id;
    }

    private void Raw(byte value)
    {
        output.GetSpan(1)[0] = value;
        output.Advance(1);
    }
}
