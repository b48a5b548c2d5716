using Parquet;

namespace Sweeps.Engine.Runs;

/// <summary>
/// Writes columns held in memory as one Parquet file of one row group (Snappy): point parts with Sweeps' own column
/// writer (the writer's warm-up and `check`'s size estimate; runs write their parts as they compute them,
/// <see cref="PartStream"/>) and attractor parts with Parquet.Net. The file is written under a temporary name in the
/// same folder and renamed into place, so readers and resumes never see a partial part. Nothing time-dependent goes
/// into it: the same chunk always gives the same bytes.
/// </summary>
public static class PartWriter
{
    // String columns with a handful of distinct values: regime classes.
    private static readonly string[] DictionaryColumns = ["regime", "backward_regime", "regime_before", "regime_after"];

    /// <summary>
    /// The writer settings of every table Sweeps writes: Snappy; the regime columns dictionary-encoded (Parquet.Net writes
    /// strings plainly unless a column is named in its encoding hints: 70 KB of a 125 000-row part, 105 bytes encoded);
    /// the point index, which rises by one along a part, delta-encoded (500 KB, 271 bytes).
    /// </summary>
    internal static ParquetOptions Options()
    {
        var options = new ParquetOptions { CompressionMethod = CompressionMethod.Snappy };
        foreach (var name in DictionaryColumns)
        {
            options.ColumnEncodingHints[name] = EncodingHint.Dictionary;
        }

        options.ColumnEncodingHints["point"] = EncodingHint.DeltaBinaryPacked;
        return options;
    }

    /// <summary>
    /// Writes and deletes a one-row part of <paramref name="spec"/>'s schema (and an attractor part, where the run
    /// writes them) in the temporary folder. The first write of a process spends time compiling or loading the writer
    /// (a tenth of a second for Parquet.Net without ReadyToRun); a run does this on a spare thread while it plans, so
    /// its first chunk does not wait for it.
    /// </summary>
    public static async Task WarmUpAsync(Specs.SweepSpec spec)
    {
        var n = spec.Model.Variables.Count;
        var branches = spec.Grid.Follow is not null;
        var columns = ChunkColumns.For(spec, 1, branches);
        var row = Core.Analysis.PointResult.Stopped(Core.Analysis.Regime.Unresolved, n, new double[n], null, "warm-up");
        columns.Add(0, new double[spec.Grid.Axes.Count], row);
        if (branches)
        {
            columns.AddBackward(row, hysteresis: false);
        }

        var path = Path.Combine(Path.GetTempPath(), $"sweeps-warm-up-{Guid.NewGuid():N}.parquet");
        try
        {
            await WriteAsync(path, new PartSchema(spec), columns, new Dictionary<string, string>(), CancellationToken.None);
            if (spec.GroupsAttractors)
            {
                var attractors = new AttractorColumns(n);
                attractors.Add(0, Core.Attractors.AttractorGrouping.Single(row, spec.Analysis)[0]);
                await WriteAsync(path + ".attractors", new AttractorSchema(spec), attractors, new Dictionary<string, string>(), CancellationToken.None);
            }
        }
        finally
        {
            File.Delete(path);
            File.Delete(path + ".attractors");
        }
    }

    /// <summary>
    /// Writes a point part with Sweeps' own column writer (<see cref="Columnar.ColumnarFile"/>); its footer also carries
    /// the part's counts (<see cref="PartTally"/>).
    /// </summary>
    internal static Task WriteAsync(string path, PartSchema schema, ChunkColumns columns, IReadOnlyDictionary<string, string> metadata, CancellationToken token)
    {
        token.ThrowIfCancellationRequested();
        var withTally = metadata.ToDictionary();
        withTally[PartTally.Key] = PartTally.Of(columns).ToJson();
        return CommitAsync(
            path,
            stream =>
            {
                PartFile.Write(stream, schema, columns, withTally);
                return Task.CompletedTask;
            });
    }

    internal static Task WriteAsync(string path, AttractorSchema schema, AttractorColumns columns, IReadOnlyDictionary<string, string> metadata, CancellationToken token) =>
        CommitAsync(
            path,
            async stream =>
            {
                await using var writer = await ParquetWriter.CreateAsync(schema.Schema, stream, Options(), false, token);
                writer.CustomMetadata = metadata.ToDictionary();
                await WriteRowGroupAsync(writer, schema, columns, token);
            });

    /// <summary>Writes a file under a temporary name in the same folder and renames it into place.</summary>
    private static async Task CommitAsync(string path, Func<Stream, Task> write)
    {
        var temporary = TemporaryPath(path);
        try
        {
            await using (var stream = new FileStream(temporary, FileMode.CreateNew, FileAccess.Write, FileShare.None, 1 << 16))
            {
                await write(stream);
            }

            Publish(temporary, path);
        }
        finally
        {
            File.Delete(temporary);
        }
    }

    /// <summary>A new temporary name beside <paramref name="path"/>, for the file until it is complete.</summary>
    internal static string TemporaryPath(string path) => $"{path}.tmp-{Guid.NewGuid():N}";

    /// <summary>Renames a complete file into place, unless a file is there already (then the temporary one stays to be deleted).</summary>
    internal static void Publish(string temporary, string path)
    {
        try
        {
            // At-least-once delivery can run a chunk twice; the first complete file wins, and both are identical.
            if (!File.Exists(path))
            {
                File.Move(temporary, path, overwrite: false);
            }
        }
        catch (IOException) when (File.Exists(path))
        {
            // Another run of the same chunk renamed its file first.
        }
    }

    internal static async Task WriteRowGroupAsync(ParquetWriter writer, AttractorSchema schema, AttractorColumns columns, CancellationToken token)
    {
        using var group = writer.CreateRowGroup();
        await group.WriteAsync(schema.Point, new ReadOnlyMemory<long>(columns.Point.ToArray()), null, null, token);
        await group.WriteAsync(schema.Id, new ReadOnlyMemory<int>(columns.Id.ToArray()), null, null, token);
        await group.WriteAsync(schema.Regime, columns.Regime.ToArray());
        await group.WriteAsync(schema.Period, new ReadOnlyMemory<int>(columns.Period.ToArray()), null, null, token);
        await group.WriteAsync(schema.PeriodTime, new ReadOnlyMemory<double>(columns.PeriodTime.ToArray()), null, null, token);
        await group.WriteAsync(schema.BasinFraction, new ReadOnlyMemory<double>(columns.BasinFraction.ToArray()), null, null, token);
        await group.WriteAsync(schema.StartCount, new ReadOnlyMemory<int>(columns.StartCount.ToArray()), null, null, token);
        await group.WriteAsync(schema.FirstStart, new ReadOnlyMemory<int>(columns.FirstStart.ToArray()), null, null, token);
        await WriteLists(group, schema.Lyapunov, columns.Lyapunov, token);
        await WriteLists(group, schema.LyapunovError, columns.LyapunovError, token);
        await WriteLists(group, schema.State, columns.State, token);
        await WriteLists(group, schema.Low, columns.Low, token);
        await WriteLists(group, schema.High, columns.High, token);
        await group.WriteAsync(schema.Reason, columns.Reason.ToArray()!);
    }

    private static async Task WriteLists(ParquetRowGroupWriter group, IReadOnlyList<Parquet.Schema.DataField<double>> fields, List<double>[] values, CancellationToken token)
    {
        for (var i = 0; i < fields.Count; i++)
        {
            await group.WriteAsync(fields[i], new ReadOnlyMemory<double>(values[i].ToArray()), null, null, token);
        }
    }
}
