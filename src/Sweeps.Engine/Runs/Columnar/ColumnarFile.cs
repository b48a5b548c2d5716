using System.Buffers;
using System.Buffers.Binary;
using System.Runtime.InteropServices;
using System.Text;

namespace Sweeps.Engine.Runs.Columnar;

/// <summary>
/// A Parquet file of one or more row groups, each written column by column in schema order (the first row group sets the
/// schema; every later one repeats its columns in the same order): each column in version-1 data pages
/// (after a dictionary page for dictionary-encoded strings), Snappy-compressed where that pays, then the footer with the schema,
/// statistics and key–value metadata. Numeric columns and the samples' list are cut into pages of at most
/// <see cref="PageValues"/> values (whole rows), so that what a page is copied, compressed and written through stays
/// small and warm in the processor's cache. Only what part files use: required int32/int64/double/boolean columns, optional
/// strings (plain or dictionary-encoded) and optional lists of required doubles.
/// </summary>
/// <remarks>
/// Written here rather than through Parquet.Net because part files are on the hot path of every run: Parquet.Net spends
/// 35–45 ms on a 125 000-row part (hashing every regime string for its dictionary, re-encoding the samples' levels,
/// copying each column), a quarter of the time it takes to compute the part. This writer compresses fixed-width
/// columns straight from the chunk's arrays and only when a probe shows they shrink, takes the regime dictionary from
/// the few distinct strings, and makes and encodes the samples' levels a block at a time from per-row counts: a part
/// written alone takes 8–13 ms against Parquet.Net's 13–30 ms (docs/performance.md). Everything else (attractor
/// parts, exports, diffs) and all reading stay with Parquet.Net.
/// </remarks>
internal sealed partial class ColumnarFile : IDisposable
{
    /// <summary>
    /// Values in a page of a numeric or list column (256 KB of doubles): a column chunk written as one page needed a page
    /// body and a compressed copy as large as the column — 8 MB each for the samples of a 125 000-row map part — and
    /// memory touched for the first time costs more than compressing it (docs/performance.md, tenth session).
    /// </summary>
    public const int PageValues = 1 << 15;

    private static ReadOnlySpan<byte> Magic => "PAR1"u8;

    private readonly Stream stream;
    private readonly int pageValues;
    private readonly List<SchemaNode> schema = [];
    private readonly List<ColumnChunk> chunks = [];
    private readonly List<(ColumnChunk[] Chunks, long Rows)> groups = [];
    private int schemaAt;
    private readonly PooledBuffer body = new(1 << 16);
    private readonly PooledBuffer header = new(256);
    private int topLevel;
    private long position;

    /// <param name="stream">Where the file goes.</param>
    /// <param name="pageValues">Values in a page of a numeric or list column at most (a row longer than that is a page of its own).</param>
    public ColumnarFile(Stream stream, int pageValues = PageValues)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(pageValues, 1);
        this.pageValues = pageValues;
        if (!BitConverter.IsLittleEndian)
        {
            throw new PlatformNotSupportedException("Part files are written from little-endian memory.");
        }

        this.stream = stream;
        Raw(Magic);
    }

    public void Int64Delta(string name, ReadOnlySpan<long> values)
    {
        Leaf(name, Physical.Int64, Repetition.Required, Annotation.Int64);
        body.Clear();
        DeltaEncoder.Encode(values, body);
        Chunk([name], Physical.Int64, ValueEncoding.DeltaBinaryPacked, values.Length, body.WrittenSpan, ColumnStatistics.Of(values), levels: false);
    }

    public void Int32(string name, ReadOnlySpan<int> values)
    {
        Leaf(name, Physical.Int32, Repetition.Required, Annotation.Int32);
        PlainPages([name], Physical.Int32, MemoryMarshal.AsBytes(values), sizeof(int), ColumnStatistics.Of(values));
    }

    public void Double(string name, ReadOnlySpan<double> values)
    {
        Leaf(name, Physical.Double, Repetition.Required, Annotation.None);
        PlainPages([name], Physical.Double, MemoryMarshal.AsBytes(values), sizeof(double), ColumnStatistics.Of(values, 0));
    }

    /// <summary>A required fixed-width column, plain: its pages are slices of the values themselves, nothing is copied.</summary>
    private void PlainPages(string[] path, Physical type, ReadOnlySpan<byte> bytes, int width, ColumnStatistics statistics)
    {
        var values = bytes.Length / width;
        BeginChunk(Compressible(bytes) ? Codec.Snappy : Codec.Uncompressed);
        var dataPage = position;
        var first = 0;
        do
        {
            var count = Math.Min(pageValues, values - first);
            Page(PageKind.Data, ValueEncoding.Plain, count, bytes.Slice(first * width, count * width));
            first += count;
        }
        while (first < values);

        EndChunk(path, type, [ValueEncoding.Plain], values, dataPage, null, statistics);
    }

    public void Boolean(string name, ReadOnlySpan<bool> values)
    {
        Leaf(name, Physical.Boolean, Repetition.Required, Annotation.None);
        body.Clear();
        var bytes = body.GetSpan((values.Length + 7) / 8)[..((values.Length + 7) / 8)];
        bytes.Clear();
        for (var i = 0; i < values.Length; i++)
        {
            bytes[i >> 3] |= (byte)((values[i] ? 1 : 0) << (i & 7));
        }

        body.Advance(bytes.Length);
        Chunk([name], Physical.Boolean, ValueEncoding.Plain, values.Length, body.WrittenSpan, ColumnStatistics.Of(values), levels: false);
    }

    /// <summary>An optional string column with a handful of distinct values: a dictionary page, then the indices.</summary>
    public void DictionaryStrings(string name, ReadOnlySpan<string?> values)
    {
        Leaf(name, Physical.ByteArray, Repetition.Optional, Annotation.String);
        var entries = new List<string>();
        var indices = ScratchPools.Ints.Rent(values.Length);
        var definitions = ScratchPools.Ints.Rent(values.Length);
        try
        {
            var present = 0;
            string? previous = null;
            var previousIndex = -1;
            for (var i = 0; i < values.Length; i++)
            {
                var value = values[i];
                definitions[i] = value is null ? 0 : 1;
                if (value is null)
                {
                    continue;
                }

                // Rows of a chunk share a few interned names: the previous row's is nearly always the same object.
                if (!ReferenceEquals(value, previous))
                {
                    previousIndex = entries.IndexOf(value);
                    if (previousIndex < 0)
                    {
                        previousIndex = entries.Count;
                        entries.Add(value);
                    }

                    previous = value;
                }

                indices[present++] = previousIndex;
            }

            var encoded = entries.Select(Encoding.UTF8.GetBytes).ToArray();
            BeginChunk(Codec.Snappy);
            var dictionaryPage = position;
            body.Clear();
            foreach (var entry in encoded)
            {
                PlainBinary(entry);
            }

            Page(PageKind.Dictionary, ValueEncoding.Plain, entries.Count, body.WrittenSpan);
            var dataPage = position;
            body.Reset(LevelBound(values.Length) * 2);
            Levels(definitions.AsSpan(0, values.Length), 1);
            var width = Math.Max(1, BitPacking.Width((ulong)Math.Max(entries.Count - 1, 0)));
            body.GetSpan(1)[0] = (byte)width;
            body.Advance(1);
            HybridEncoder.Encode(indices.AsSpan(0, present), width, body);
            Page(PageKind.Data, ValueEncoding.RleDictionary, values.Length, body.WrittenSpan);
            EndChunk([name], Physical.ByteArray, [ValueEncoding.Plain, ValueEncoding.Rle, ValueEncoding.RleDictionary], values.Length, dataPage, dictionaryPage, ColumnStatistics.Of(encoded, values.Length - present));
        }
        finally
        {
            ScratchPools.Ints.Return(indices);
            ScratchPools.Ints.Return(definitions);
        }
    }

    /// <summary>
    /// An optional string column written plainly (mostly nulls, values free text), from the values' UTF-8 bytes: row i is
    /// <paramref name="text"/>[<paramref name="starts"/>[i] …] of <paramref name="lengths"/>[i] bytes, null where that is −1.
    /// </summary>
    public void Strings(string name, ReadOnlySpan<byte> text, ReadOnlySpan<int> starts, ReadOnlySpan<int> lengths)
    {
        Leaf(name, Physical.ByteArray, Repetition.Optional, Annotation.String);
        var definitions = ScratchPools.Ints.Rent(lengths.Length);
        try
        {
            var size = 0;
            for (var i = 0; i < lengths.Length; i++)
            {
                definitions[i] = lengths[i] < 0 ? 0 : 1;
                size += lengths[i] < 0 ? 0 : 4 + lengths[i];
            }

            // Sized at once: a page body grown by doubling is fresh memory at every step.
            body.Reset(LevelBound(lengths.Length) + size);
            Levels(definitions.AsSpan(0, lengths.Length), 1);
            var statistics = new ColumnStatistics.Strings();
            for (var i = 0; i < lengths.Length; i++)
            {
                if (lengths[i] < 0)
                {
                    statistics.AddNull();
                    continue;
                }

                var value = text.Slice(starts[i], lengths[i]);
                PlainBinary(value);
                statistics.Add(value);
            }

            Chunk([name], Physical.ByteArray, ValueEncoding.Plain, lengths.Length, body.WrittenSpan, statistics.Result(), levels: true);
        }
        finally
        {
            ScratchPools.Ints.Return(definitions);
        }
    }

    /// <summary>
    /// An optional list of required doubles (the three-level LIST layout), never null, from its values and the number of
    /// values in each row (0: an empty list).
    /// </summary>
    public void DoubleList(string name, ReadOnlySpan<double> values, ReadOnlySpan<int> counts)
    {
        Node(new SchemaNode(name, null, Repetition.Optional, 1, Annotation.List), topLevel: true);
        Node(new SchemaNode("list", null, Repetition.Repeated, 1, Annotation.None), topLevel: false);
        Node(new SchemaNode("element", Physical.Double, Repetition.Required, 0, Annotation.None), topLevel: false);
        var levels = ListLevels.Count(counts);

        // The codec follows the values alone: the levels at a page's start always shrink, chaotic samples do not.
        BeginChunk(Compressible(MemoryMarshal.AsBytes(values)) ? Codec.Snappy : Codec.Uncompressed);
        var dataPage = position;
        var (row, value) = (0, 0);
        do
        {
            // Whole rows, as many as fit in a page's values (at least one; an empty row takes a level, no value).
            var (rows, pageLevels, pageValueCount) = (0, 0, 0);
            while (row + rows < counts.Length && (rows == 0 || pageLevels + Math.Max(1, counts[row + rows]) <= pageValues))
            {
                pageLevels += Math.Max(1, counts[row + rows]);
                pageValueCount += counts[row + rows];
                rows++;
            }

            var rowCounts = counts.Slice(row, rows);
            var bytes = MemoryMarshal.AsBytes(values.Slice(value, pageValueCount));
            body.Reset((2 * LevelBound(pageLevels)) + bytes.Length);
            var at = BeginLength();
            ListLevels.Encode(rowCounts, repetition: true, body);
            EndLength(at);
            at = BeginLength();
            ListLevels.Encode(rowCounts, repetition: false, body);
            EndLength(at);
            bytes.CopyTo(body.GetSpan(bytes.Length));
            body.Advance(bytes.Length);
            Page(PageKind.Data, ValueEncoding.Plain, pageLevels, body.WrittenSpan);
            (row, value) = (row + rows, value + pageValueCount);
        }
        while (row < counts.Length);

        EndChunk([name, "list", "element"], Physical.Double, [ValueEncoding.Plain, ValueEncoding.Rle], levels, dataPage, null, ColumnStatistics.Of(values, levels - values.Length));
    }

    public void Dispose()
    {
        body.Dispose();
        header.Dispose();
    }

    /// <summary>
    /// Ends a row group of <paramref name="rows"/> rows: the columns written since the last one (all of the schema's, in
    /// its order) are its column chunks.
    /// </summary>
    public void EndRowGroup(long rows)
    {
        if (schemaAt != schema.Count || chunks.Count == 0)
        {
            throw new InvalidOperationException($"A row group ended after {schemaAt} of the schema's {schema.Count} elements.");
        }

        groups.Add((chunks.ToArray(), rows));
        chunks.Clear();
        schemaAt = 0;
    }

    private void Leaf(string name, Physical type, Repetition repetition, Annotation annotation) =>
        Node(new SchemaNode(name, type, repetition, 0, annotation), topLevel: true);

    /// <summary>
    /// A schema element: added while the first row group is written; in every later one it must be the element at the
    /// same place (row groups share the file's one schema).
    /// </summary>
    private void Node(SchemaNode node, bool topLevel)
    {
        if (groups.Count == 0)
        {
            schema.Add(node);
            this.topLevel += topLevel ? 1 : 0;
        }
        else if (schemaAt >= schema.Count || schema[schemaAt] != node)
        {
            throw new InvalidOperationException($"Column '{node.Name}' does not follow the schema of the file's first row group.");
        }

        schemaAt++;
    }

    /// <summary>
    /// At most the bytes of <paramref name="count"/> levels or indices of up to eight bits, hybrid-encoded, with their
    /// length: a bit-packed group of eight takes at most eight bytes and a header byte, a run at least eight values at most
    /// eleven bytes.
    /// </summary>
    private static int LevelBound(int count) => 4 + 16 + (2 * count);

    /// <summary>Levels of a version-1 data page: their byte length, then the hybrid encoding.</summary>
    private void Levels(ReadOnlySpan<int> levels, int width)
    {
        var at = BeginLength();
        HybridEncoder.Encode(levels, width, body);
        EndLength(at);
    }

    /// <summary>Leaves room for the byte length of what follows in the page (levels); returns where it goes.</summary>
    private int BeginLength()
    {
        var at = body.WrittenCount;
        body.GetSpan(4);
        body.Advance(4);
        return at;
    }

    private void EndLength(int at) => body.SetInt32(at, body.WrittenCount - at - 4);

    private void PlainBinary(ReadOnlySpan<byte> value)
    {
        var span = body.GetSpan(4 + value.Length);
        BinaryPrimitives.WriteInt32LittleEndian(span, value.Length);
        value.CopyTo(span[4..]);
        body.Advance(4 + value.Length);
    }

    private void PlainBinary(string value)
    {
        var length = Encoding.UTF8.GetByteCount(value);
        var span = body.GetSpan(4 + length);
        BinaryPrimitives.WriteInt32LittleEndian(span, length);
        Encoding.UTF8.GetBytes(value, span[4..]);
        body.Advance(4 + length);
    }
}
