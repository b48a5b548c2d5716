using System.Security.Cryptography;
using System.Text;
using ParquetSharp;

namespace Sweeps.EndToEnd.Tests;

/// <summary>
/// Reads a run's part files with ParquetSharp (Apache parquet-cpp), a reader independent of the
/// writers Sweeps uses (its own for point parts, Parquet.Net for the others), so that the files are
/// checked as any other tool would see them.
/// </summary>
internal sealed record IndependentReader(IReadOnlyList<string> Columns, IReadOnlyList<string> Types, IReadOnlyList<object?[]> Rows)
{
    /// <summary>Reads every part file of one table of a run: "parts" (one row per point) or "attractors".</summary>
    public static IndependentReader ReadRun(string runDirectory, string table = "parts")
    {
        var rows = new List<object?[]>();
        string[] columns = [];
        string[] types = [];
        foreach (var file in Directory.GetFiles(Path.Combine(runDirectory, table), "*.parquet").Order(StringComparer.Ordinal))
        {
            using var reader = new ParquetFileReader(file);
            var schema = reader.FileMetaData.Schema;
            columns = Enumerable.Range(0, schema.NumColumns).Select(i => schema.Column(i).Path.ToDotString()).ToArray();
            types = Enumerable.Range(0, schema.NumColumns).Select(i => schema.Column(i).PhysicalType.ToString()).ToArray();
            for (var g = 0; g < reader.FileMetaData.NumRowGroups; g++)
            {
                using var group = reader.RowGroup(g);
                var count = (int)group.MetaData.NumRows;
                var data = new object?[columns.Length][];
                for (var c = 0; c < columns.Length; c++)
                {
                    data[c] = ReadColumn(group.Column(c), schema.Column(c), count);
                }

                for (var r = 0; r < count; r++)
                {
                    rows.Add(data.Select(column => column[r]).ToArray());
                }
            }
        }

        return new IndependentReader(columns, types, rows);
    }

    /// <summary>The number of rows of one part file, read through its row groups.</summary>
    public static long ReadRunFile(string partFile)
    {
        using var reader = new ParquetFileReader(partFile);
        return Enumerable.Range(0, reader.FileMetaData.NumRowGroups).Sum(g =>
        {
            using var group = reader.RowGroup(g);
            return group.MetaData.NumRows;
        });
    }

    /// <summary>The encodings of each column chunk of a part file's first row group, by column path.</summary>
    public static IReadOnlyDictionary<string, IReadOnlyList<ParquetSharp.Encoding>> Encodings(string partFile)
    {
        using var reader = new ParquetFileReader(partFile);
        using var group = reader.RowGroup(0);
        var schema = reader.FileMetaData.Schema;
        return Enumerable.Range(0, schema.NumColumns).ToDictionary(
            c => schema.Column(c).Path.ToDotString(),
            c =>
            {
                using var chunk = group.MetaData.GetColumnChunkMetaData(c);
                return (IReadOnlyList<ParquetSharp.Encoding>)chunk.Encodings.ToArray();
            });
    }

    public static IReadOnlyDictionary<string, string> Metadata(string partFile)
    {
        using var reader = new ParquetFileReader(partFile);
        return reader.FileMetaData.KeyValueMetadata;
    }

    /// <summary>SHA-256 over all rows sorted by point, values by their exact bits: equal hashes mean bit-identical results.</summary>
    public string Hash()
    {
        var builder = new StringBuilder();
        foreach (var row in Rows.OrderBy(r => (long)r[0]!))
        {
            foreach (var value in row)
            {
                builder.Append(value switch
                {
                    double d => BitConverter.DoubleToInt64Bits(d).ToString("x16"),
                    double[] list => string.Join(";", list.Select(d => BitConverter.DoubleToInt64Bits(d).ToString("x16"))),
                    null => "null",
                    _ => value.ToString(),
                }).Append('|');
            }

            builder.Append('\n');
        }

        return Convert.ToHexString(SHA256.HashData(System.Text.Encoding.UTF8.GetBytes(builder.ToString())));
    }

    private static object?[] ReadColumn(ColumnReader column, ColumnDescriptor descriptor, int count)
    {
        if (descriptor.MaxRepetitionLevel > 0)
        {
            return column.LogicalReader<double[]>().ReadAll(count).Cast<object?>().ToArray();
        }

        return descriptor.PhysicalType switch
        {
            PhysicalType.Int64 => column.LogicalReader<long>().ReadAll(count).Cast<object?>().ToArray(),
            PhysicalType.Int32 => column.LogicalReader<int>().ReadAll(count).Cast<object?>().ToArray(),
            PhysicalType.Boolean => column.LogicalReader<bool>().ReadAll(count).Cast<object?>().ToArray(),
            PhysicalType.Double => column.LogicalReader<double>().ReadAll(count).Cast<object?>().ToArray(),
            PhysicalType.ByteArray => column.LogicalReader<string?>().ReadAll(count).Cast<object?>().ToArray(),
            _ => throw new NotSupportedException(descriptor.PhysicalType.ToString()),
        };
    }
}
