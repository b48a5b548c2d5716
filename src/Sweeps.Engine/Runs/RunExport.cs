using System.Globalization;
using System.Text;
using Parquet;

namespace Sweeps.Engine.Runs;

/// <summary>
/// A whole run as one file, for tools that want one: a merged Parquet file (the parts' row groups in point order, same
/// columns and metadata, written by the parts' own writer) or CSV. Streams a row group at a time, so memory stays bounded
/// by one row group whatever the size of the run or the samples per point.
/// </summary>
public static class RunExport
{
    public static async Task<long> ParquetAsync(RunDirectory run, string path, CancellationToken token)
    {
        var schema = new PartSchema(run.LoadSpec());
        var parts = Parts(run);
        var temporary = PartWriter.TemporaryPath(path);
        var rows = 0L;
        try
        {
            await using (var stream = new FileStream(temporary, FileMode.CreateNew, FileAccess.Write, FileShare.None, 1 << 16))
            {
                using var file = new Columnar.ColumnarFile(stream);
                foreach (var part in parts)
                {
                    await foreach (var columns in PartReader.ReadGroupsAsync(part, schema, token))
                    {
                        PartFile.WriteRowGroup(file, schema, columns);
                        rows += columns.Count;
                    }
                }

                if (parts.Count == 0)
                {
                    // A run with no part yet: its columns, no rows.
                    PartFile.WriteRowGroup(file, schema, ChunkColumns.For(schema, 0));
                }

                file.Finish(await MetadataAsync(parts, token), PartFile.CreatedBy);
            }

            File.Move(temporary, path, overwrite: true);
            return rows;
        }
        finally
        {
            File.Delete(temporary);
        }
    }

    public static async Task<long> CsvAsync(RunDirectory run, TextWriter output, CancellationToken token)
    {
        var spec = run.LoadSpec();
        var schema = new PartSchema(spec);
        var header = new[] { "point" }
            .Concat(schema.Axes.Select(a => a.Name))
            .Concat(["regime", "period", "period_time", "attractors"])
            .Concat(schema.Lyapunov.Select(f => f.Name))
            .Concat(schema.LyapunovError.Select(f => f.Name))
            .Concat(schema.Final.Select(f => f.Name))
            .Concat(schema.Indicators.Select(f => f.Name))
            .Concat(["reason", "samples"])
            .Concat(schema.HasBranches
                ? ["hysteresis", "backward_regime", "backward_period", "backward_lyapunov_1", .. schema.BackwardFinal.Select(f => f.Name), "backward_samples"]
                : []);
        await output.WriteLineAsync(string.Join(",", header));
        var rows = 0L;
        var line = new StringBuilder();
        foreach (var part in Parts(run))
        {
            await foreach (var columns in PartReader.ReadGroupsAsync(part, schema, token))
            {
                var samples = new SampleCursor(columns);
                var backwardSamples = columns.Backward is { } back ? new SampleCursor(back) : null;
                for (var row = 0; row < columns.Count; row++)
                {
                    line.Clear();
                    line.Append(columns.Point[row].ToString(CultureInfo.InvariantCulture));
                    foreach (var axis in columns.Axis)
                    {
                        line.Append(',').Append(Number(axis[row]));
                    }

                    line.Append(',').Append(columns.Regime[row]).Append(',').Append(columns.Period[row].ToString(CultureInfo.InvariantCulture));
                    line.Append(',').Append(Number(columns.PeriodTime[row]));
                    line.Append(',').Append(columns.Attractors[row].ToString(CultureInfo.InvariantCulture));
                    foreach (var column in columns.Lyapunov.Concat(columns.LyapunovError).Concat(columns.Final).Concat(columns.Indicators))
                    {
                        line.Append(',').Append(Number(column[row]));
                    }

                    line.Append(',').Append(Quote(columns.Reason(row))).Append(',');
                    samples.AppendRow(line);
                    if (columns.Backward is { } backward)
                    {
                        line.Append(',').Append(columns.Hysteresis[row] ? "true" : "false");
                        line.Append(',').Append(backward.Regime[row]).Append(',').Append(backward.Period[row].ToString(CultureInfo.InvariantCulture));
                        line.Append(',').Append(Number(backward.Lyapunov[0][row]));
                        foreach (var column in backward.Final)
                        {
                            line.Append(',').Append(Number(column[row]));
                        }

                        line.Append(',');
                        backwardSamples!.AppendRow(line);
                    }

                    await output.WriteLineAsync(line.ToString());
                    rows++;
                }
            }
        }

        return rows;
    }

    /// <summary>Appends a row's samples, ';'-separated, through a cursor over the column.</summary>
    private sealed class SampleCursor(ChunkColumns columns)
    {
        private readonly ChunkColumns.SampleCursor cursor = new(columns);
        private readonly List<double> row = [];

        public void AppendRow(StringBuilder line)
        {
            cursor.Next(row);
            line.AppendJoin(';', row.Select(Number));
        }
    }

    /// <summary>Doubles in round-trip form; NaN, Infinity and -Infinity spelt as .NET, pandas and DuckDB read them.</summary>
    public static string Number(double value) => value switch
    {
        double.PositiveInfinity => "Infinity",
        double.NegativeInfinity => "-Infinity",
        _ when double.IsNaN(value) => "NaN",
        _ => value.ToString("R", CultureInfo.InvariantCulture),
    };

    private static string Quote(string? text) =>
        text is null ? "" : "\"" + text.Replace("\"", "\"\"", StringComparison.Ordinal) + "\"";

    private static List<string> Parts(RunDirectory run) =>
        Enumerable.Range(0, (int)run.Manifest.ChunkCount).Select(c => run.PartPath(c)).Where(File.Exists).ToList();

    private static async Task<Dictionary<string, string>> MetadataAsync(List<string> parts, CancellationToken token)
    {
        if (parts.Count == 0)
        {
            return [];
        }

        // The run's metadata, without the first part's own counts.
        await using var reader = await ParquetReader.CreateAsync(parts[0], null, token);
        return reader.CustomMetadata.Where(m => m.Key != PartTally.Key).ToDictionary();
    }
}
