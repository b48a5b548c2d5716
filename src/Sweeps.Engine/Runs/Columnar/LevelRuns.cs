using System.Buffers;
using System.Buffers.Binary;

namespace Sweeps.Engine.Runs.Columnar;

/// <summary>
/// Parquet's RLE / bit-packing hybrid for levels one or two bits wide, fed with runs of equal levels instead of the
/// levels one by one. It makes the choices <see cref="HybridEncoder"/> makes on the same levels — a run that still
/// holds eight values once the literals before it fill whole groups becomes a repeated run, the rest is bit-packed — so
/// for fewer than <see cref="LiteralCap"/> levels it writes the same bytes. A list column's levels are regular (a row
/// of samples is a 0 and then 1s; every value has definition 2), so a row costs a few runs here rather than a
/// level written, scanned and packed one at a time: the samples' levels had taken 3 % of a map sweep's processor
/// time (docs/performance.md, fourteenth session).
/// </summary>
internal sealed class LevelRuns : IDisposable
{
    private const int Group = 8;

    /// <summary>Literal levels written as one bit-packed run at most (2 048 groups), where they end a whole group.</summary>
    public const int LiteralCap = 1 << 14;

    private readonly int width;
    private readonly IBufferWriter<byte> output;

    // The bit-packed levels not written yet (zero beyond them), and the run being gathered.
    private byte[] literals;
    private int pending;
    private int value = -1;
    private long length;

    public LevelRuns(int width, IBufferWriter<byte> output)
    {
        if (width is not (1 or 2))
        {
            throw new ArgumentOutOfRangeException(nameof(width), width, "levels of one or two bits");
        }

        this.width = width;
        this.output = output;
        literals = ScratchPools.Bytes.Rent(256);
        Array.Clear(literals);
    }

    /// <summary>Adds <paramref name="count"/> levels equal to <paramref name="level"/> (joined to the run before when equal).</summary>
    public void Add(int level, long count)
    {
        if (count <= 0)
        {
            return;
        }

        if (level == value)
        {
            length += count;
            return;
        }

        Emit();
        (value, length) = (level, count);
    }

    /// <summary>Writes what is left; the last bit-packed group is padded with zeros (readers stop at the page's level count).</summary>
    public void Finish()
    {
        Emit();
        (value, length) = (-1, 0);
        WriteLiterals();
    }

    public void Dispose() => ScratchPools.Bytes.Return(literals);

    /// <summary>The gathered run: repeated if it is long enough to spare the literals before it their last group, else bit-packed.</summary>
    private void Emit()
    {
        if (length == 0)
        {
            return;
        }

        var fill = (Group - (pending % Group)) % Group;
        if (length >= fill + Group)
        {
            Pack(value, fill);
            WriteLiterals();
            Varint.Write((ulong)(length - fill) << 1, output);
            output.GetSpan(1)[0] = (byte)value;
            output.Advance(1);
            return;
        }

        // Fewer than 15 levels: one unaligned 64-bit OR holds them.
        Pack(value, (int)length);
        if (pending >= LiteralCap && pending % Group == 0)
        {
            WriteLiterals();
        }
    }

    /// <summary>Appends <paramref name="count"/> (at most 15) levels equal to <paramref name="level"/> to the bit-packed ones.</summary>
    private void Pack(int level, int count)
    {
        if (count == 0)
        {
            return;
        }

        var bit = pending * width;
        var at = bit >> 3;
        if (at + sizeof(ulong) > literals.Length)
        {
            var larger = ScratchPools.Bytes.Rent(2 * literals.Length);
            literals.AsSpan(0, at + 1).CopyTo(larger);
            Array.Clear(larger, at + 1, larger.Length - at - 1);
            ScratchPools.Bytes.Return(literals);
            literals = larger;
        }

        // `count` copies of the level, `width` bits each, lowest first (1 → all ones; 2 bits: the level in every pair).
        var bits = count * width;
        var pattern = ((ulong)level * (width == 1 ? ulong.MaxValue : 0x5555_5555_5555_5555UL)) & ((1UL << bits) - 1);
        var slot = literals.AsSpan(at, sizeof(ulong));
        BinaryPrimitives.WriteUInt64LittleEndian(slot, BinaryPrimitives.ReadUInt64LittleEndian(slot) | (pattern << (bit & 7)));
        pending += count;
    }

    /// <summary>The bit-packed levels as one run of whole groups (the last padded), and the buffer cleared for the next.</summary>
    private void WriteLiterals()
    {
        if (pending == 0)
        {
            return;
        }

        var groups = (pending + Group - 1) / Group;
        var bytes = groups * width;
        Varint.Write(((ulong)groups << 1) | 1, output);
        literals.AsSpan(0, bytes).CopyTo(output.GetSpan(bytes));
        output.Advance(bytes);
        Array.Clear(literals, 0, Math.Min(literals.Length, bytes + sizeof(ulong)));
        pending = 0;
    }
}
