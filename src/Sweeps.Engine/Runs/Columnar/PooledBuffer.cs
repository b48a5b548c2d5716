using System.Buffers;

namespace Sweeps.Engine.Runs.Columnar;

/// <summary>
/// A growable byte buffer on arrays rented from the shared pool: a part's pages are megabytes each, and fresh arrays
/// for every page of every part would be large-object garbage.
/// </summary>
internal sealed class PooledBuffer : IBufferWriter<byte>, IDisposable
{
    private byte[] array;
    private int written;

    public PooledBuffer(int capacity = 4096)
    {
        array = ScratchPools.Bytes.Rent(capacity);
    }

    public ReadOnlySpan<byte> WrittenSpan => array.AsSpan(0, written);

    public int WrittenCount => written;

    public void Clear() => written = 0;

    /// <summary>Empties the buffer and makes room for <paramref name="capacity"/> bytes at once (no regrowing and copying as it fills).</summary>
    public void Reset(int capacity)
    {
        written = 0;
        if (capacity > array.Length)
        {
            ScratchPools.Bytes.Return(array);
            array = ScratchPools.Bytes.Rent(capacity);
        }
    }

    public void Advance(int count) => written += count;

    /// <summary>Overwrites four bytes already written with a little-endian integer (a length known only afterwards).</summary>
    public void SetInt32(int offset, int value) => System.Buffers.Binary.BinaryPrimitives.WriteInt32LittleEndian(array.AsSpan(offset, 4), value);

    public Memory<byte> GetMemory(int sizeHint = 0)
    {
        Reserve(sizeHint);
        return array.AsMemory(written);
    }

    public Span<byte> GetSpan(int sizeHint = 0)
    {
        Reserve(sizeHint);
        return array.AsSpan(written);
    }

    public void Dispose()
    {
        ScratchPools.Bytes.Return(array);
        array = [];
    }

    private void Reserve(int sizeHint)
    {
        var needed = written + Math.Max(sizeHint, 1);
        if (needed <= array.Length)
        {
            return;
        }

        var larger = ScratchPools.Bytes.Rent(Math.Max(needed, array.Length * 2));
        array.AsSpan(0, written).CopyTo(larger);
        ScratchPools.Bytes.Return(array);
        array = larger;
    }
}
