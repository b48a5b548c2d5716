using ParquetSharp;

namespace Sweeps.Engine.Tests.Runs;

/// <summary>Part files read back through ParquetSharp (Apache parquet-cpp), independent of both Parquet writers used here.</summary>
internal static class IndependentParquet
{
    /// <summary>Values with doubles as their exact bits (NaN payloads and the sign of zero included).</summary>
    internal static IEnumerable<string> Bits(IEnumerable<object?> values) => values.Select(v => v switch
    {
        double d => BitConverter.DoubleToInt64Bits(d).ToString("x16"),
        double[] list => string.Join(";", list.Select(d => BitConverter.DoubleToInt64Bits(d).ToString("x16"))),
        null => "null",
        _ => v.ToString()!,
    });

    internal static int ColumnIndex(ParquetFileReader reader, string path)
    {
        var schema = reader.FileMetaData.Schema;
        return Enumerable.Range(0, schema.NumColumns).Single(c => schema.Column(c).Path.ToDotString() == path);
    }

    internal static Table ReadIndependently(byte[] bytes)
    {
        using var file = new Temporary(bytes);
        return ReadIndependently(file.Path);
    }

    /// <summary>Every column of the file at <paramref name="path"/>, the rows of all its row groups in turn.</summary>
    internal static Table ReadIndependently(string path)
    {
        using var reader = new ParquetFileReader(path);
        var schema = reader.FileMetaData.Schema;
        var table = new Table();
        for (var g = 0; g < reader.FileMetaData.NumRowGroups; g++)
        {
            using var group = reader.RowGroup(g);
            var rows = (int)group.MetaData.NumRows;
            table.GroupRows.Add(rows);
            for (var c = 0; c < schema.NumColumns; c++)
            {
                var descriptor = schema.Column(c);
                var name = descriptor.Path.ToDotString().Split('.')[0];
                using var column = group.Column(c);
                object?[] values = descriptor switch
                {
                    { MaxRepetitionLevel: > 0 } => column.LogicalReader<double[]?>().ReadAll(rows),
                    { PhysicalType: PhysicalType.Int64 } => column.LogicalReader<long>().ReadAll(rows).Cast<object?>().ToArray(),
                    { PhysicalType: PhysicalType.Int32 } => column.LogicalReader<int>().ReadAll(rows).Cast<object?>().ToArray(),
                    { PhysicalType: PhysicalType.Boolean } => column.LogicalReader<bool>().ReadAll(rows).Cast<object?>().ToArray(),
                    { PhysicalType: PhysicalType.Double } => column.LogicalReader<double>().ReadAll(rows).Cast<object?>().ToArray(),
                    _ => column.LogicalReader<string?>().ReadAll(rows),
                };
                table[name] = [.. table.GetValueOrDefault(name) ?? [], .. values];
                if (g == 0)
                {
                    table.Descriptors.Add((descriptor.Path.ToDotString(), descriptor.PhysicalType, descriptor.LogicalType.ToString(), descriptor.MaxDefinitionLevel, descriptor.MaxRepetitionLevel));
                }
            }
        }

        return table;
    }

    internal static IEnumerable<string> Describe(IEnumerable<(string Path, PhysicalType Type, string Logical, short Definition, short Repetition)> columns) =>
        columns.Select(c => $"{c.Path} {c.Type} {c.Logical} def {c.Definition} rep {c.Repetition}");

    /// <summary>Columns read back by name, in file order (the rows of every row group in turn), with their descriptions.</summary>
    internal sealed class Table : Dictionary<string, object?[]>
    {
        public List<(string Path, PhysicalType Type, string Logical, short Definition, short Repetition)> Descriptors { get; } = [];

        /// <summary>The rows of each row group, as its metadata gives them.</summary>
        public List<int> GroupRows { get; } = [];
    }

    internal sealed class Temporary : IDisposable
    {
        public Temporary(byte[] bytes)
        {
            File.WriteAllBytes(Path, bytes);
        }

        public string Path { get; } = System.IO.Path.Combine(System.IO.Path.GetTempPath(), $"sweeps-part-{Guid.NewGuid():N}.parquet");

        public void Dispose() => File.Delete(Path);
    }
}
