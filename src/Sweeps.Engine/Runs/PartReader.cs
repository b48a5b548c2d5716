using System.Buffers;
using Parquet;
using Parquet.Schema;

namespace Sweeps.Engine.Runs;

/// <summary>Reads part files back into <see cref="ChunkColumns"/> (for export and other whole-row uses): a whole part, or a row group at a time.</summary>
internal static class PartReader
{
    public static async Task<ChunkColumns> ReadAsync(string path, PartSchema schema, CancellationToken token)
    {
        await using var reader = await ParquetReader.CreateAsync(path, null, token);
        var rows = (int)Enumerable.Range(0, reader.RowGroupCount).Sum(g => reader.OpenRowGroupReader(g).RowCount);
        var columns = ChunkColumns.For(schema, rows);
        var offset = 0;
        for (var g = 0; g < reader.RowGroupCount; g++)
        {
            using var group = reader.OpenRowGroupReader(g);
            await ReadGroupAsync(group, schema, columns, offset, token);
            offset += (int)group.RowCount;
        }

        columns.SetCount(rows);
        columns.Backward?.SetCount(rows);
        return columns;
    }

    /// <summary>
    /// A part's row groups one after the other, each in columns of its own: memory bounded by a row group (a chunk's part
    /// is written in row groups of at most a few megabytes of columns), not by the part.
    /// </summary>
    public static async IAsyncEnumerable<ChunkColumns> ReadGroupsAsync(string path, PartSchema schema, [System.Runtime.CompilerServices.EnumeratorCancellation] CancellationToken token)
    {
        await using var reader = await ParquetReader.CreateAsync(path, null, token);
        for (var g = 0; g < reader.RowGroupCount; g++)
        {
            using var group = reader.OpenRowGroupReader(g);
            var rows = (int)group.RowCount;
            var columns = ChunkColumns.For(schema, rows);
            await ReadGroupAsync(group, schema, columns, 0, token);
            columns.SetCount(rows);
            columns.Backward?.SetCount(rows);
            yield return columns;
        }
    }

    /// <summary>Reads one row group into <paramref name="columns"/>, its rows from <paramref name="offset"/> on.</summary>
    private static async Task ReadGroupAsync(ParquetRowGroupReader group, PartSchema schema, ChunkColumns columns, int offset, CancellationToken token)
    {
        var count = (int)group.RowCount;
        await Read(group, schema.Point, columns.Point.AsMemory(offset, count), token);
        for (var a = 0; a < schema.Axes.Count; a++)
        {
            await Read(group, schema.Axes[a], columns.Axis[a].AsMemory(offset, count), token);
        }

        var regime = new string[count];
        await group.ReadAsync(schema.Regime, regime, null, token);
        regime.CopyTo(columns.Regime, offset);
        await Read(group, schema.Period, columns.Period.AsMemory(offset, count), token);
        await Read(group, schema.PeriodTime, columns.PeriodTime.AsMemory(offset, count), token);
        await Read(group, schema.Attractors, columns.Attractors.AsMemory(offset, count), token);
        for (var i = 0; i < schema.Lyapunov.Count; i++)
        {
            await Read(group, schema.Lyapunov[i], columns.Lyapunov[i].AsMemory(offset, count), token);
            await Read(group, schema.LyapunovError[i], columns.LyapunovError[i].AsMemory(offset, count), token);
            await Read(group, schema.Final[i], columns.Final[i].AsMemory(offset, count), token);
        }

        for (var i = 0; i < schema.Indicators.Count; i++)
        {
            await Read(group, schema.Indicators[i], columns.Indicators[i].AsMemory(offset, count), token);
        }

        var reason = new string[count];
        await group.ReadAsync(schema.Reason, reason, null, token);
        for (var i = 0; i < count; i++)
        {
            columns.SetReason(offset + i, reason[i]);
        }

        await ReadSamples(group, schema.SampleValue, columns, offset, token);
        if (columns.Backward is { } backward)
        {
            await Read(group, schema.Hysteresis, columns.Hysteresis.AsMemory(offset, count), token);
            var backwardRegime = new string[count];
            await group.ReadAsync(schema.BackwardRegime, backwardRegime, null, token);
            backwardRegime.CopyTo(backward.Regime, offset);
            await Read(group, schema.BackwardPeriod, backward.Period.AsMemory(offset, count), token);
            await Read(group, schema.BackwardLyapunov, backward.Lyapunov[0].AsMemory(offset, count), token);
            for (var i = 0; i < schema.BackwardFinal.Count; i++)
            {
                await Read(group, schema.BackwardFinal[i], backward.Final[i].AsMemory(offset, count), token);
            }

            await ReadSamples(group, schema.BackwardSampleValue, backward, offset, token);
        }
    }

    private static async Task ReadSamples(ParquetRowGroupReader group, DataField field, ChunkColumns columns, int offset, CancellationToken token)
    {
        var levels = (int)group.GetMetadata(field)!.MetaData!.NumValues;
        var values = new double[levels];
        var definitions = new int[levels];
        var repetitions = new int[levels];
        await group.ReadRawAsync<double>(field, values, definitions, repetitions, token);
        var used = definitions.Count(d => d == 2);
        columns.SampleValues.Write(values.AsSpan(0, used));
        Columnar.ListLevels.Rows(repetitions, definitions, columns.SampleCounts.AsSpan(offset));
    }

    private static async Task Read<T>(ParquetRowGroupReader group, DataField field, Memory<T> target, CancellationToken token)
        where T : struct => await group.ReadAsync<T>(field, target, null, token);
}
