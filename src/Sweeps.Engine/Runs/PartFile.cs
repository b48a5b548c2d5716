using Sweeps.Engine.Runs.Columnar;

namespace Sweeps.Engine.Runs;

/// <summary>A chunk's columns as a point part, in the order and with the types of <see cref="PartSchema"/>.</summary>
internal static class PartFile
{
    /// <summary>The footer's created_by: the program and its version.</summary>
    public static string CreatedBy => $"sweeps version {ProgramInfo.Version}";

    /// <param name="pageValues">Values in a page of a numeric or list column at most (<see cref="ColumnarFile.PageValues"/>).</param>
    public static void Write(Stream stream, PartSchema schema, ChunkColumns columns, IEnumerable<KeyValuePair<string, string>> metadata, int pageValues = ColumnarFile.PageValues)
    {
        using var file = new ColumnarFile(stream, pageValues);
        WriteRowGroup(file, schema, columns);
        file.Finish(metadata, CreatedBy);
    }

    /// <summary>The columns' rows as the next row group of <paramref name="file"/>.</summary>
    public static void WriteRowGroup(ColumnarFile file, PartSchema schema, ChunkColumns columns)
    {
        var count = columns.Count;
        file.Int64Delta(schema.Point.Name, columns.Point.AsSpan(0, count));
        for (var a = 0; a < schema.Axes.Count; a++)
        {
            file.Double(schema.Axes[a].Name, columns.Axis[a].AsSpan(0, count));
        }

        file.DictionaryStrings(schema.Regime.Name, columns.Regime.AsSpan(0, count));
        file.Int32(schema.Period.Name, columns.Period.AsSpan(0, count));
        file.Double(schema.PeriodTime.Name, columns.PeriodTime.AsSpan(0, count));
        file.Int32(schema.Attractors.Name, columns.Attractors.AsSpan(0, count));
        Doubles(file, schema.Lyapunov, columns.Lyapunov, count);
        Doubles(file, schema.LyapunovError, columns.LyapunovError, count);
        Doubles(file, schema.Final, columns.Final, count);
        Doubles(file, schema.Indicators, columns.Indicators, count);
        file.Strings(schema.Reason.Name, columns.ReasonBytes.WrittenSpan, columns.ReasonStart.AsSpan(0, count), columns.ReasonLength.AsSpan(0, count));
        Samples(file, schema.Samples.Name, columns);
        if (schema.HasBranches)
        {
            var backward = columns.Backward ?? throw new InvalidOperationException("A continuation sweep's chunk has no backward branch.");
            file.Boolean(schema.Hysteresis.Name, columns.Hysteresis.AsSpan(0, count));
            file.DictionaryStrings(schema.BackwardRegime.Name, backward.Regime.AsSpan(0, count));
            file.Int32(schema.BackwardPeriod.Name, backward.Period.AsSpan(0, count));
            file.Double(schema.BackwardLyapunov.Name, backward.Lyapunov[0].AsSpan(0, count));
            Doubles(file, schema.BackwardFinal, backward.Final, count);
            Samples(file, schema.BackwardSamples.Name, backward);
        }

        file.EndRowGroup(count);
    }

    private static void Doubles(ColumnarFile file, IReadOnlyList<Parquet.Schema.DataField<double>> fields, double[][] values, int count)
    {
        for (var i = 0; i < fields.Count; i++)
        {
            file.Double(fields[i].Name, values[i].AsSpan(0, count));
        }
    }

    private static void Samples(ColumnarFile file, string name, ChunkColumns columns) =>
        file.DoubleList(name, columns.SampleValues.WrittenSpan, columns.SampleCounts.AsSpan(0, columns.Count));
}
