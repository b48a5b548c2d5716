using Snappier;

namespace Sweeps.Engine.Runs.Columnar;

/// <summary>Column chunks and their pages.</summary>
internal sealed partial class ColumnarFile
{
    private long chunkStart;
    private Codec chunkCodec;
    private long chunkUncompressed;
    private long chunkCompressed;

    /// <summary>Parquet's physical types (the ones parts use).</summary>
    private enum Physical
    {
        Boolean = 0,
        Int32 = 1,
        Int64 = 2,
        Double = 5,
        ByteArray = 6,
    }

    private enum Repetition
    {
        Required = 0,
        Optional = 1,
        Repeated = 2,
    }

    /// <summary>The logical type a schema element carries, with its legacy converted type.</summary>
    private enum Annotation
    {
        None,
        String,
        List,
        Int32,
        Int64,
    }

    private enum ValueEncoding
    {
        Plain = 0,
        Rle = 3,
        DeltaBinaryPacked = 5,
        RleDictionary = 8,
    }

    private enum PageKind
    {
        Data = 0,
        Dictionary = 2,
    }

    private sealed record SchemaNode(string Name, Physical? Type, Repetition Repetition, int Children, Annotation Annotation);

    /// <summary>The compression codecs a column chunk can have.</summary>
    private enum Codec
    {
        Uncompressed = 0,
        Snappy = 1,
    }

    private sealed record ColumnChunk(
        string[] Path,
        Physical Type,
        ValueEncoding[] Encodings,
        Codec Codec,
        long Values,
        long Start,
        long Uncompressed,
        long Compressed,
        long DataPage,
        long? DictionaryPage,
        ColumnStatistics Statistics);

    /// <summary>A column of one data page, compressed when a probe of it compresses.</summary>
    private void Chunk(string[] path, Physical type, ValueEncoding encoding, int values, ReadOnlySpan<byte> page, ColumnStatistics statistics, bool levels)
    {
        BeginChunk(Compressible(page) ? Codec.Snappy : Codec.Uncompressed);
        var dataPage = position;
        Page(PageKind.Data, encoding, values, page);
        EndChunk(path, type, levels ? [encoding, ValueEncoding.Rle] : [encoding], values, dataPage, null, statistics);
    }

    private void BeginChunk(Codec codec)
    {
        chunkStart = position;
        chunkCodec = codec;
        chunkUncompressed = 0;
        chunkCompressed = 0;
    }

    private void EndChunk(string[] path, Physical type, ValueEncoding[] encodings, int values, long dataPage, long? dictionaryPage, ColumnStatistics statistics) =>
        chunks.Add(new ColumnChunk(path, type, encodings, chunkCodec, values, chunkStart, chunkUncompressed, chunkCompressed, dataPage, dictionaryPage, statistics));

    /// <summary>
    /// Whether Snappy is worth its time on a page: three slices of it (start, middle, end) must shrink by a tenth. Chaotic
    /// samples, exponents and final states, and evenly spaced axis values, do not shrink (Snappy finds no repeats in
    /// them) and are a third of a part's writing time when compressed anyway; periodic samples, periods and NaN-filled
    /// columns shrink several-fold. Decided per column chunk (the codec is the chunk's), from the data alone, so the
    /// same chunk always gives the same file.
    /// </summary>
    private static bool Compressible(ReadOnlySpan<byte> page)
    {
        const int Probe = 16 << 10;
        if (page.Length <= 3 * Probe)
        {
            return true;
        }

        Span<byte> output = stackalloc byte[Snappy.GetMaxCompressedLength(Probe)];
        var compressed = 0;
        foreach (var start in (ReadOnlySpan<int>)[0, (page.Length - Probe) / 2, page.Length - Probe])
        {
            compressed += Snappy.Compress(page.Slice(start, Probe), output);
        }

        return compressed < 0.9 * 3 * Probe;
    }

    /// <summary>One page: its header, then its body, compressed with the chunk's codec. Levels of a data page sit inside the body.</summary>
    private void Page(PageKind kind, ValueEncoding encoding, int values, ReadOnlySpan<byte> page)
    {
        var compressed = chunkCodec == Codec.Snappy ? ScratchPools.Bytes.Rent(Snappy.GetMaxCompressedLength(page.Length)) : null;
        try
        {
            var length = compressed is null ? page.Length : Snappy.Compress(page, compressed);
            header.Clear();
            var thrift = new CompactWriter(header);
            thrift.BeginStruct();
            thrift.I32(1, (int)kind);
            thrift.I32(2, page.Length);
            thrift.I32(3, length);
            if (kind == PageKind.Data)
            {
                thrift.BeginStruct(5);
                thrift.I32(1, values);
                thrift.I32(2, (int)encoding);
                thrift.I32(3, (int)ValueEncoding.Rle);
                thrift.I32(4, (int)ValueEncoding.Rle);
                thrift.EndStruct();
            }
            else
            {
                thrift.BeginStruct(7);
                thrift.I32(1, values);
                thrift.I32(2, (int)encoding);
                thrift.EndStruct();
            }

            thrift.EndStruct();
            chunkUncompressed += header.WrittenCount + page.Length;
            chunkCompressed += header.WrittenCount + length;
            Raw(header.WrittenSpan);
            Raw(compressed is null ? page : compressed.AsSpan(0, length));
        }
        finally
        {
            if (compressed is not null)
            {
                ScratchPools.Bytes.Return(compressed);
            }
        }
    }

    private void Raw(ReadOnlySpan<byte> bytes)
    {
        stream.Write(bytes);
        position += bytes.Length;
    }
}
