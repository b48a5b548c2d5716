using System.Buffers.Binary;

namespace Sweeps.Engine.Runs.Columnar;

/// <summary>The footer: Parquet's file metadata in Thrift's compact protocol, its length and the closing magic.</summary>
internal sealed partial class ColumnarFile
{
    private const int FormatVersion = 2;

    /// <summary>Writes the footer of the row groups ended so far (<see cref="EndRowGroup"/>; at least one).</summary>
    public void Finish(IEnumerable<KeyValuePair<string, string>> metadata, string createdBy)
    {
        if (groups.Count == 0 || chunks.Count > 0)
        {
            throw new InvalidOperationException("A file is finished after its last row group ends.");
        }

        header.Clear();
        var thrift = new CompactWriter(header);
        thrift.BeginStruct();
        thrift.I32(1, FormatVersion);
        thrift.List(2, CompactWriter.Element.Struct, schema.Count + 1);
        thrift.BeginStruct();
        thrift.String(4, "root");
        thrift.I32(5, topLevel);
        thrift.EndStruct();
        foreach (var node in schema)
        {
            SchemaElement(thrift, node);
        }

        thrift.I64(3, groups.Sum(g => g.Rows));
        thrift.List(4, CompactWriter.Element.Struct, groups.Count);
        foreach (var (groupChunks, rows) in groups)
        {
            RowGroup(thrift, groupChunks, rows);
        }

        var pairs = metadata.ToArray();
        thrift.List(5, CompactWriter.Element.Struct, pairs.Length);
        foreach (var (key, value) in pairs)
        {
            thrift.BeginStruct();
            thrift.String(1, key);
            thrift.String(2, value);
            thrift.EndStruct();
        }

        thrift.String(6, createdBy);

        // Every column is ordered by its type's own order (what the statistics' min_value and max_value follow).
        thrift.List(7, CompactWriter.Element.Struct, groups[0].Chunks.Length);
        for (var i = 0; i < groups[0].Chunks.Length; i++)
        {
            thrift.BeginStruct();
            thrift.EmptyStruct(1);
            thrift.EndStruct();
        }

        thrift.EndStruct();
        Raw(header.WrittenSpan);
        Span<byte> length = stackalloc byte[4];
        BinaryPrimitives.WriteInt32LittleEndian(length, header.WrittenCount);
        Raw(length);
        Raw(Magic);
    }

    private static void SchemaElement(CompactWriter thrift, SchemaNode node)
    {
        thrift.BeginStruct();
        if (node.Type is { } type)
        {
            thrift.I32(1, (int)type);
        }

        thrift.I32(3, (int)node.Repetition);
        thrift.String(4, node.Name);
        if (node.Children > 0)
        {
            thrift.I32(5, node.Children);
        }

        // The converted type (UTF8 0, LIST 3, INT_32 17, INT_64 18) for older readers, then the logical type.
        switch (node.Annotation)
        {
            case Annotation.String:
                thrift.I32(6, 0);
                thrift.BeginStruct(10);
                thrift.EmptyStruct(1);
                thrift.EndStruct();
                break;
            case Annotation.List:
                thrift.I32(6, 3);
                thrift.BeginStruct(10);
                thrift.EmptyStruct(3);
                thrift.EndStruct();
                break;
            case Annotation.Int32 or Annotation.Int64:
                thrift.I32(6, node.Annotation == Annotation.Int32 ? 17 : 18);
                thrift.BeginStruct(10);
                thrift.BeginStruct(10);
                thrift.I8(1, (sbyte)(node.Annotation == Annotation.Int32 ? 32 : 64));
                thrift.Bool(2, true);
                thrift.EndStruct();
                thrift.EndStruct();
                break;
        }

        thrift.EndStruct();
    }

    private static void RowGroup(CompactWriter thrift, ColumnChunk[] chunks, long rows)
    {
        thrift.BeginStruct();
        thrift.List(1, CompactWriter.Element.Struct, chunks.Length);
        foreach (var chunk in chunks)
        {
            thrift.BeginStruct();
            thrift.I64(2, chunk.Start);
            thrift.BeginStruct(3);
            thrift.I32(1, (int)chunk.Type);
            thrift.List(2, CompactWriter.Element.I32, chunk.Encodings.Length);
            foreach (var encoding in chunk.Encodings)
            {
                thrift.I32Value((int)encoding);
            }

            thrift.List(3, CompactWriter.Element.Binary, chunk.Path.Length);
            foreach (var part in chunk.Path)
            {
                thrift.StringValue(part);
            }

            thrift.I32(4, (int)chunk.Codec);
            thrift.I64(5, chunk.Values);
            thrift.I64(6, chunk.Uncompressed);
            thrift.I64(7, chunk.Compressed);
            thrift.I64(9, chunk.DataPage);
            if (chunk.DictionaryPage is { } dictionary)
            {
                thrift.I64(11, dictionary);
            }

            Statistics(thrift, chunk.Statistics);
            thrift.EndStruct();
            thrift.EndStruct();
        }

        thrift.I64(2, chunks.Sum(c => c.Uncompressed));
        thrift.I64(3, rows);
        thrift.I64(5, chunks[0].Start);
        thrift.I64(6, chunks.Sum(c => c.Compressed));
        thrift.EndStruct();
    }

    private static void Statistics(CompactWriter thrift, ColumnStatistics statistics)
    {
        thrift.BeginStruct(12);
        thrift.I64(3, statistics.Nulls);
        if (statistics is { Min: { } min, Max: { } max })
        {
            thrift.Binary(5, max);
            thrift.Binary(6, min);
        }

        thrift.EndStruct();
    }
}
