using System.Buffers;
using CsCheck;
using ParquetSharp;
using Sweeps.Core.Analysis;
using Sweeps.Core.Indicators;
using Sweeps.Engine.Config;
using Sweeps.Engine.Runs;
using static Sweeps.Engine.Tests.Runs.IndependentParquet;

namespace Sweeps.Engine.Tests.Runs;

/// <summary>
/// Point parts from Sweeps' own column writer, read back by ParquetSharp (Apache parquet-cpp, independent of both
/// Parquet writers used here) and compared bit for bit with the columns written — and with the file Parquet.Net's
/// writer, which wrote parts before, makes of the same columns.
/// </summary>
public sealed class PartFileTests
{
    // A continuation sweep of a two-variable map with indicators: every kind of column a part can hold.
    private const string Config = """
        [model]
        kind = "map"
        variables = ["x", "y"]
        parameters = ["a", "b"]
        [model.equations]
        x = "1 - a*x^2 + y"
        y = "b*x"
        [initial]
        x = 0.1
        y = 0.1
        [parameters]
        b = 0.3
        [grid]
        a = { from = 0.1, to = 1.4, steps = 20 }
        follow = "a"
        [analysis]
        transient = 10
        measure = 20
        max_period = 8
        samples = 3
        indicators = true
        """;

    private static readonly string[] Reasons = ["transient", "escaped at step 12", "gleich ±∞ — ünïcode", ""];

    // A row: regime, how many rows repeat it (runs exercise both halves of the level and index encoding), samples.
    private static readonly Gen<(Regime Regime, int Run, int Samples, double Value, int Reason, bool Flag)> Rows =
        Gen.Select(Gen.Enum<Regime>(), Gen.Int[1, 40], Gen.Int[0, 4], TestValues.Doubles, Gen.Int[-3, Reasons.Length - 1], Gen.Bool);

    [Fact]
    public void Write_ReadsBackBitForBit_ThroughAnIndependentReader()
    {
        Gen.Select(Rows.Array[1, 60], Gen.Long.Array[1, 700]).Sample(AssertRoundTrip, iter: 60);
    }

    [Fact]
    public void Write_ReadsBackBitForBit_WhenTheLevelsSpanSeveralEncodingBlocks()
    {
        // Tens of thousands of list levels: the samples' levels are made and encoded 16 384 at a time.
        Gen.Select(Rows.Array[900], Gen.Long.Array[20_000]).Sample(AssertRoundTrip, iter: 4);
    }

    [Fact]
    public async Task Write_ReadsBackARowLongerThanAnEncodingBlock()
    {
        // 20 000 values in one row, more than the 16 384 levels encoded at a time, between an empty row and a short one;
        // read back independently and, levels and all, by the reader Sweeps uses (which counts rows by repetition level 0).
        var rows = new[] { (Regime.Chaotic, 1, 0, 0.5, -1, false), (Regime.Chaotic, 1, 10_000, 0.25, -1, false), (Regime.Periodic, 1, 2, 1.0, -1, false) };
        AssertRoundTrip(rows, [0, 1, 2]);
        var (schema, columns) = Build(rows, [0, 1, 2]);
        using var file = new Temporary(Write(schema, columns));
        var back = await PartReader.ReadAsync(file.Path, schema, CancellationToken.None);
        Assert.Equal([0, 20_000, 4], back.SampleCounts.Take(back.Count));
        Assert.Equal([0, 20_000, 4], back.Backward!.SampleCounts.Take(back.Count));
    }

    [Fact]
    public void Write_ReadsBackBitForBit_WhenPagesSplitTheColumns()
    {
        // Pages of a few values: numeric columns and the samples' list cut into many pages, rows longer than a page alone in theirs.
        Gen.Select(Rows.Array[1, 60], Gen.Long.Array[1, 700], Gen.Int[1, 12]).Sample((rows, points, page) => AssertRoundTrip(rows, points, page), iter: 60);
    }

    [Fact]
    public async Task Write_ReadsBack_ThroughTheReaderSweepsUses_WhenPagesSplitTheColumns()
    {
        var (schema, columns) = Build(Rows.Array[40].Single(), Gen.Long[0, long.MaxValue].Array[500].Single());
        using var file = new Temporary(Write(schema, columns, pageValues: 5));
        var back = await PartReader.ReadAsync(file.Path, schema, CancellationToken.None);
        Assert.Equal(columns.Point.Take(columns.Count), back.Point.Take(back.Count));
        Assert.Equal(Bits(columns.Lyapunov[1].Take(columns.Count).Cast<object?>()), Bits(back.Lyapunov[1].Take(back.Count).Cast<object?>()));
        Assert.Equal(columns.Period.Take(columns.Count), back.Period.Take(back.Count));
        Assert.Equal(columns.SampleValues.WrittenSpan.ToArray(), back.SampleValues.WrittenSpan.ToArray());
        Assert.Equal(columns.SampleCounts.Take(columns.Count), back.SampleCounts.Take(back.Count));
        Assert.Equal(columns.Backward!.SampleCounts.Take(columns.Count), back.Backward!.SampleCounts.Take(back.Count));
    }

    [Fact]
    public void Write_CutsColumnsIntoPages_OfAtMostTheValuesGiven()
    {
        // One value a page: every row of the forward branch's 14 numeric columns (and more) a page of its own, each
        // with a header of at least a dozen bytes (Thrift: type, two sizes, the data page's count and three encodings).
        var (schema, columns) = Build(Enumerable.Repeat((Regime.Periodic, 1, 1, 0.5, -1, false), 200).ToArray(), Enumerable.Range(0, 200).Select(i => (long)i).ToArray());
        var whole = Write(schema, columns);
        var paged = Write(schema, columns, pageValues: 1);
        Assert.True(paged.Length - whole.Length >= 12 * 199 * 14, $"{paged.Length} bytes against {whole.Length}");
        Assert.Equal(Bits(ReadIndependently(whole)["samples"]), Bits(ReadIndependently(paged)["samples"]));
    }

    [Fact]
    public void RowGroups_ReadBackAsTheRowsOfOneGroup_ThroughAnIndependentReader()
    {
        // A part written a row group at a time as its chunk is computed (PartStream): cut anywhere, the file holds the
        // same rows, in order, as the part written whole, with each row group's own row count in its metadata.
        Gen.Select(Rows.Array[1, 60], Gen.Long.Array[2, 700], Gen.Int[1, 5], Gen.Int[1, 12]).Sample((rows, points, groups, page) =>
        {
            var (schema, whole) = Build(rows, points);
            var expanded = rows.SelectMany(r => Enumerable.Repeat(r with { Run = 1 }, r.Run)).Take(points.Length).ToArray();
            var cuts = Enumerable.Range(0, groups).Select(g => g * expanded.Length / groups).Append(expanded.Length).Distinct().ToArray();
            using var stream = new MemoryStream();
            using (var file = new Sweeps.Engine.Runs.Columnar.ColumnarFile(stream, page))
            {
                for (var g = 0; g + 1 < cuts.Length; g++)
                {
                    var (from, to) = (cuts[g], cuts[g + 1]);
                    PartFile.WriteRowGroup(file, schema, Build(expanded[from..to], points[from..to], from).Columns);
                }

                file.Finish(new Dictionary<string, string>(), "test");
            }

            var table = ReadIndependently(stream.ToArray());
            Assert.Equal(cuts.Zip(cuts.Skip(1), (from, to) => to - from), table.GroupRows);
            AssertSame(whole, table, backward: false);
            AssertSame(whole.Backward!, table, backward: true);
            Assert.Equal(whole.Hysteresis.Take(whole.Count).Cast<object?>(), table["hysteresis"]);
            Assert.Equal(whole.Reasons(whole.Count), table["reason"].Cast<string?>());
        }, iter: 40);
    }

    [Fact]
    public void RowGroups_MustRepeatTheColumnsOfTheFirst()
    {
        // A file has one schema: a row group of another table's columns is refused — one without the backward branch,
        // and one of as many columns under other names (the model's variables renamed).
        var (schema, columns) = Build(Rows.Array[5].Single(), [1, 2, 3]);
        var renamed = Config
            .Replace("[\"x\", \"y\"]", "[\"u\", \"v\"]")
            .Replace("x = \"1 - a*x^2 + y\"", "u = \"1 - a*u^2 + v\"")
            .Replace("y = \"b*x\"", "v = \"b*u\"")
            .Replace("x = 0.1", "u = 0.1")
            .Replace("y = 0.1", "v = 0.1");
        foreach (var config in new[] { Config.Replace("follow = \"a\"", ""), renamed })
        {
            var other = new PartSchema(SpecReader.Parse(config, "other.toml"));
            Assert.NotEqual(schema.Schema.Fields.Select(f => f.Name), other.Schema.Fields.Select(f => f.Name));
            using var file = new Sweeps.Engine.Runs.Columnar.ColumnarFile(new MemoryStream());
            PartFile.WriteRowGroup(file, schema, columns);
            Assert.Throws<InvalidOperationException>(() => PartFile.WriteRowGroup(file, other, columns));
        }
    }

    [Fact]
    public void Write_CompressesTheSamples_OnlyWhenTheirValuesShrink()
    {
        // The codec of the samples' list follows its values, not the levels in front of them (which always shrink).
        var random = new Random(11);
        var rows = Enumerable.Repeat((Regime.Chaotic, 1, 4, 0.0, -1, false), 20_000).ToArray();
        var (schema, columns) = Build(rows, Enumerable.Range(0, 20_000).Select(i => (long)i).ToArray());
        var noisy = columns.SampleValues.WrittenSpan.ToArray();
        for (var i = 0; i < noisy.Length; i++)
        {
            noisy[i] = random.NextDouble();
        }

        columns.SampleValues.ResetWrittenCount();
        columns.SampleValues.Write(noisy);
        Assert.Equal(Compression.Uncompressed, Codec(Write(schema, columns), "samples.list.element"));

        var (periodicSchema, periodic) = Build(rows, Enumerable.Range(0, 20_000).Select(i => (long)i).ToArray());
        Assert.Equal(Compression.Snappy, Codec(Write(periodicSchema, periodic), "samples.list.element"));
    }

    private static Compression Codec(byte[] bytes, string column)
    {
        using var file = new Temporary(bytes);
        using var reader = new ParquetFileReader(file.Path);
        using var group = reader.RowGroup(0);
        using var chunk = group.MetaData.GetColumnChunkMetaData(ColumnIndex(reader, column));
        return chunk.Compression;
    }

    private static void AssertRoundTrip((Regime Regime, int Run, int Samples, double Value, int Reason, bool Flag)[] rows, long[] points) =>
        AssertRoundTrip(rows, points, Sweeps.Engine.Runs.Columnar.ColumnarFile.PageValues);

    private static void AssertRoundTrip((Regime Regime, int Run, int Samples, double Value, int Reason, bool Flag)[] rows, long[] points, int pageValues)
    {
        var (schema, columns) = Build(rows, points);
        var table = ReadIndependently(Write(schema, columns, pageValues));
        var reasons = rows.SelectMany(r => Enumerable.Repeat(r.Reason >= 0 ? Reasons[r.Reason] : null, r.Run)).Take(points.Length);
        Assert.Equal(reasons, table["reason"].Cast<string?>());
        AssertSame(columns, table, backward: false);
        AssertSame(columns.Backward!, table, backward: true);
        Assert.Equal(columns.Hysteresis.Take(columns.Count).Cast<object?>(), table["hysteresis"]);
    }

    [Fact]
    public async Task Write_GivesTheTableParquetNetWrites_ForTheSameColumns()
    {
        var (schema, columns) = Build(Rows.Array[30].Single(), Gen.Long[0, 1000].Array[300].Single().Order().ToArray());
        var ours = ReadIndependently(Write(schema, columns));
        var theirs = ReadIndependently(await WriteWithParquetNet(schema, columns));

        // Same columns, physical and logical types, repetition; same values bit for bit.
        Assert.Equal(Describe(theirs.Descriptors), Describe(ours.Descriptors));
        Assert.Equal(theirs.Keys, ours.Keys);
        foreach (var name in theirs.Keys)
        {
            Assert.Equal(Bits(theirs[name]), Bits(ours[name]));
        }
    }

    [Fact]
    public async Task Write_ReadsBack_ThroughTheReaderSweepsUses()
    {
        var (schema, columns) = Build(Rows.Array[40].Single(), Gen.Long[0, long.MaxValue].Array[500].Single());
        var path = Path.Combine(Path.GetTempPath(), $"sweeps-part-{Guid.NewGuid():N}.parquet");
        try
        {
            await File.WriteAllBytesAsync(path, Write(schema, columns));
            var back = await PartReader.ReadAsync(path, schema, CancellationToken.None);
            Assert.Equal(columns.Count, back.Count);
            Assert.Equal(columns.Point.Take(columns.Count), back.Point.Take(back.Count));
            Assert.Equal(columns.Regime.Take(columns.Count), back.Regime.Take(back.Count));
            Assert.Equal(columns.Reasons(columns.Count), back.Reasons(back.Count));
            Assert.Equal(Bits(columns.Lyapunov[1].Take(columns.Count).Cast<object?>()), Bits(back.Lyapunov[1].Take(back.Count).Cast<object?>()));
            Assert.Equal(columns.SampleValues.WrittenSpan.ToArray(), back.SampleValues.WrittenSpan.ToArray());
            Assert.Equal(columns.SampleCounts.Take(columns.Count), back.SampleCounts.Take(back.Count));
            Assert.Equal(columns.Backward!.Regime.Take(columns.Count), back.Backward!.Regime.Take(back.Count));
            Assert.Equal(columns.Hysteresis.Take(columns.Count), back.Hysteresis.Take(back.Count));
        }
        finally
        {
            File.Delete(path);
        }
    }

    [Fact]
    public void Write_KeepsNoReasonOfEarlierRows_WhenColumnsAreReused()
    {
        // A run reuses a chunk's columns for its next chunk; the reasons' text is kept as bytes, which must start afresh.
        var spec = SpecReader.Parse(Config, "test.toml");
        var columns = ChunkColumns.For(spec, 3, branches: true);
        void Add(long point, string? reason)
        {
            var result = reason is null ? PointResult.Stopped(Regime.Divergent, 2, [0, 0], 3, "x") with { Reason = null } : PointResult.Stopped(Regime.Unresolved, 2, [0, 0], null, reason);
            columns.Add(point, [0.5], result);
            columns.AddBackward(result, hysteresis: false);
        }

        Add(0, "a long reason of a row of the chunk before");
        Add(1, null);
        columns.Clear();
        Add(7, "gleich ±∞ — ünïcode");
        Add(8, null);
        Add(9, "");
        string?[] expected = ["gleich ±∞ — ünïcode", null, ""];
        Assert.Equal(expected, columns.Reasons(3));
        Assert.Equal(System.Text.Encoding.UTF8.GetByteCount(expected[0]!), columns.ReasonBytes.WrittenCount);
        Assert.Equal(expected, ReadIndependently(Write(new PartSchema(spec), columns))["reason"].Cast<string?>());
    }

    [Fact]
    public void ListLevels_GiveBackTheRowCounts_TheyWereMadeFrom()
    {
        // Parquet's levels of a non-null list (Apache Parquet format, "Nested encoding"): one level per value, one per empty row.
        Gen.Int[0, 5].Array[0, 300].Sample(counts =>
        {
            var levels = Sweeps.Engine.Runs.Columnar.ListLevels.Count(counts);
            Assert.Equal(counts.Sum(c => Math.Max(1, c)), levels);
            var (repetitions, definitions) = (new int[levels], new int[levels]);
            Sweeps.Engine.Runs.Columnar.ListLevels.Fill(counts, repetitions, definitions);
            Assert.Equal(counts.Length, repetitions.Count(r => r == 0));
            Assert.Equal(counts.Sum(), definitions.Count(d => d == 2));
            var back = new int[counts.Length];
            Assert.Equal(counts.Length, Sweeps.Engine.Runs.Columnar.ListLevels.Rows(repetitions, definitions, back));
            Assert.Equal(counts, back);
        });
    }

    [Fact]
    public void LevelRuns_WriteTheBytesTheHybridEncoderWrites_ForTheSameLevels()
    {
        // Parquet's RLE / bit-packing hybrid (Apache Parquet format, "Encodings", RLE): the run-fed encoder of list levels
        // against the level-by-level one, on up to LiteralCap levels (beyond it the run-fed one cuts its literal runs).
        var runs = Gen.Select(Gen.Int[0, 3], Gen.Int[1, 40]).Array[1, 300];
        Gen.Select(Gen.Int[1, 2], runs).Sample((width, drawn) =>
        {
            var levels = drawn.SelectMany(r => Enumerable.Repeat(r.Item1 & ((1 << width) - 1), r.Item2)).ToArray();
            var expected = new System.Buffers.ArrayBufferWriter<byte>();
            Sweeps.Engine.Runs.Columnar.HybridEncoder.Encode(levels, width, expected);

            var actual = new System.Buffers.ArrayBufferWriter<byte>();
            using (var encoder = new Sweeps.Engine.Runs.Columnar.LevelRuns(width, actual))
            {
                foreach (var (level, count) in drawn)
                {
                    encoder.Add(level & ((1 << width) - 1), count);
                }

                encoder.Finish();
            }

            Assert.Equal(expected.WrittenSpan.ToArray(), actual.WrittenSpan.ToArray());
        });
    }

    [Theory]
    [InlineData(4)]
    [InlineData(8)]
    public void Write_ReadsBackBitForBit_WhenEveryRowHoldsAsManySamples(int samples)
    {
        // A sweep's rows carry the same number of samples (8 or 16 values here, two variables): tens of thousands of
        // levels in one regular pattern, cut into several bit-packed runs or repeated runs of 1s.
        var rows = Enumerable.Range(0, 75).Select(i => (Regime.Periodic, 40, samples, 0.5 + i, -1, i % 2 == 0)).ToArray();
        AssertRoundTrip(rows, Enumerable.Range(0, 3000).Select(i => (long)i).ToArray());
    }

    [Fact]
    public void Write_GivesTheSameBytes_EveryTime()
    {
        var (schema, columns) = Build(Rows.Array[20].Single(), Gen.Long.Array[200].Single());
        Assert.Equal(Write(schema, columns), Write(schema, columns));
    }

    [Fact]
    public void Statistics_LeaveNaNOut_AndGiveZeroItsSign()
    {
        // The format's rules for floating-point statistics (Apache Parquet format, parquet.thrift, Statistics and
        // ColumnOrder): NaN takes no part in min_value/max_value; a zero minimum is written −0, a zero maximum +0.
        var rows = Enumerable.Range(0, 6).Select(i => (Regime.Chaotic, 1, 1, 0.0, -1, false)).ToArray();
        var (schema, columns) = Build(rows, [5, 6, 7, 8, 9, 10]);
        double[] exponents = [double.NaN, 0.0, 2.5, double.NaN, -0.0, 1.0];
        exponents.CopyTo(columns.Lyapunov[0], 0);
        double[] positive = [3, 0.0, 2, 1, 4, 5];
        positive.CopyTo(columns.Lyapunov[1], 0);
        Array.Fill(columns.PeriodTime, double.NaN);
        using var file = new Temporary(Write(schema, columns));
        using var reader = new ParquetFileReader(file.Path);
        using var group = reader.RowGroup(0);
        var index = ColumnIndex(reader, "lyapunov_1");
        using (var chunk = group.MetaData.GetColumnChunkMetaData(index))
        {
            var statistics = (Statistics<double>)chunk.Statistics!;
            Assert.Equal(BitConverter.DoubleToInt64Bits(-0.0), BitConverter.DoubleToInt64Bits(statistics.Min));
            Assert.Equal(2.5, statistics.Max);
        }

        using (var chunk = group.MetaData.GetColumnChunkMetaData(ColumnIndex(reader, "lyapunov_2")))
        {
            var statistics = (Statistics<double>)chunk.Statistics!;
            Assert.Equal(BitConverter.DoubleToInt64Bits(-0.0), BitConverter.DoubleToInt64Bits(statistics.Min));
            Assert.Equal(5.0, statistics.Max);
        }

        using (var chunk = group.MetaData.GetColumnChunkMetaData(ColumnIndex(reader, "point")))
        {
            var statistics = (Statistics<long>)chunk.Statistics!;
            Assert.Equal((5L, 10L), (statistics.Min, statistics.Max));
        }

        using (var chunk = group.MetaData.GetColumnChunkMetaData(ColumnIndex(reader, "period_time")))
        {
            Assert.False(chunk.Statistics!.HasMinMax);
        }
    }

    [Fact]
    public void Write_CompressesAColumn_OnlyWhenItShrinks()
    {
        // 20 000 rows: pseudo-random exponents do not shrink under Snappy, a NaN-filled column and one period do.
        var random = new Random(7);
        var rows = Enumerable.Range(0, 20_000).Select(i => (Regime.Periodic, 1, 0, 0.0, -1, false)).ToArray();
        var (schema, columns) = Build(rows, Enumerable.Range(0, 20_000).Select(i => (long)i).ToArray());
        for (var i = 0; i < columns.Count; i++)
        {
            columns.Lyapunov[0][i] = random.NextDouble();
            columns.PeriodTime[i] = double.NaN;
            columns.Period[i] = 2;
        }

        using var file = new Temporary(Write(schema, columns));
        using var reader = new ParquetFileReader(file.Path);
        using var group = reader.RowGroup(0);
        Compression Codec(string name)
        {
            using var chunk = group.MetaData.GetColumnChunkMetaData(ColumnIndex(reader, name));
            return chunk.Compression;
        }

        Assert.Equal(Compression.Uncompressed, Codec("lyapunov_1"));
        Assert.Equal(Compression.Snappy, Codec("period_time"));
        Assert.Equal(Compression.Snappy, Codec("period"));
        Assert.Equal(Compression.Snappy, Codec("regime"));
    }

    /// <summary>Columns of a continuation sweep's part, one row per entry of <paramref name="rows"/> (runs expanded) up to the points given.</summary>
    /// <remarks>Row i's values follow from its entry and from <paramref name="first"/> + i (a slice of a larger table, rows
    /// <paramref name="first"/> on, is built with runs of one and its own <paramref name="first"/>).</remarks>
    private static (PartSchema Schema, ChunkColumns Columns) Build(
        IReadOnlyList<(Regime Regime, int Run, int Samples, double Value, int Reason, bool Flag)> rows, long[] points, int first = 0)
    {
        var spec = SpecReader.Parse(Config, "test.toml");
        var expanded = rows.SelectMany(r => Enumerable.Repeat(r, r.Run)).Take(points.Length).ToArray();
        var columns = ChunkColumns.For(spec, expanded.Length, branches: true);
        for (var row = 0; row < expanded.Length; row++)
        {
            var i = first + row;
            var (regime, _, samples, value, reason, flag) = expanded[row];
            var state = new[] { value, -i };
            var result = new PointResult(
                regime,
                i % 7,
                [value, i * 0.25],
                [Math.Abs(value) / 3, 0],
                double.NaN,
                state,
                [],
                null,
                reason >= 0 ? Reasons[reason] : null,
                Enumerable.Range(0, samples * 2).Select(k => value + k).ToArray(),
                i % 3 == 0 ? double.NaN : i,
                i % 2 == 0 ? new IndicatorValues(value, i, -i) : null);
            columns.Add(points[row], [value * 2], result, 1 + (i % 4));
            columns.AddBackward(result with { Regime = flag ? Regime.Divergent : regime, Samples = result.Samples.Reverse().ToArray() }, flag);
        }

        return (new PartSchema(spec), columns);
    }

    private static byte[] Write(PartSchema schema, ChunkColumns columns, int pageValues = Sweeps.Engine.Runs.Columnar.ColumnarFile.PageValues)
    {
        using var stream = new MemoryStream();
        PartFile.Write(stream, schema, columns, new Dictionary<string, string> { ["sweeps.test"] = "ü" }, pageValues);
        return stream.ToArray();
    }

    private static async Task<byte[]> WriteWithParquetNet(PartSchema schema, ChunkColumns columns)
    {
        using var stream = new MemoryStream();
        await using (var writer = await Parquet.ParquetWriter.CreateAsync(schema.Schema, stream, PartWriter.Options(), false))
        {
            await WriteRowGroupWithParquetNet(writer, schema, columns, CancellationToken.None);
        }

        return stream.ToArray();
    }

    /// <summary>The columns as one row group through Parquet.Net, column by column: the reference for Sweeps' own writer.</summary>
    private static async Task WriteRowGroupWithParquetNet(Parquet.ParquetWriter writer, PartSchema schema, ChunkColumns columns, CancellationToken token)
    {
        using var group = writer.CreateRowGroup();
        var count = columns.Count;
        await group.WriteAsync(schema.Point, new ReadOnlyMemory<long>(columns.Point, 0, count), null, null, token);
        for (var a = 0; a < schema.Axes.Count; a++)
        {
            await group.WriteAsync(schema.Axes[a], new ReadOnlyMemory<double>(columns.Axis[a], 0, count), null, null, token);
        }

        await group.WriteAsync(schema.Regime, new ArraySegment<string>(columns.Regime, 0, count));
        await group.WriteAsync(schema.Period, new ReadOnlyMemory<int>(columns.Period, 0, count), null, null, token);
        await group.WriteAsync(schema.PeriodTime, new ReadOnlyMemory<double>(columns.PeriodTime, 0, count), null, null, token);
        await group.WriteAsync(schema.Attractors, new ReadOnlyMemory<int>(columns.Attractors, 0, count), null, null, token);
        await WriteAll(group, schema.Lyapunov, columns.Lyapunov, count, token);
        await WriteAll(group, schema.LyapunovError, columns.LyapunovError, count, token);
        await WriteAll(group, schema.Final, columns.Final, count, token);
        await WriteAll(group, schema.Indicators, columns.Indicators, count, token);
        await group.WriteAsync(schema.Reason, columns.Reasons(count)!);
        await WriteSamples(group, schema.SampleValue, columns, token);
        if (schema.HasBranches && columns.Backward is { } backward)
        {
            await group.WriteAsync(schema.Hysteresis, new ReadOnlyMemory<bool>(columns.Hysteresis, 0, count), null, null, token);
            await group.WriteAsync(schema.BackwardRegime, new ArraySegment<string>(backward.Regime, 0, count));
            await group.WriteAsync(schema.BackwardPeriod, new ReadOnlyMemory<int>(backward.Period, 0, count), null, null, token);
            await group.WriteAsync(schema.BackwardLyapunov, new ReadOnlyMemory<double>(backward.Lyapunov[0], 0, count), null, null, token);
            await WriteAll(group, schema.BackwardFinal, backward.Final, count, token);
            await WriteSamples(group, schema.BackwardSampleValue, backward, token);
        }
    }

    private static Task WriteSamples(Parquet.ParquetRowGroupWriter group, Parquet.Schema.DataField<double> field, ChunkColumns columns, CancellationToken token)
    {
        var counts = columns.SampleCounts.AsSpan(0, columns.Count);
        var levels = Sweeps.Engine.Runs.Columnar.ListLevels.Count(counts);
        var (repetitions, definitions) = (new int[levels], new int[levels]);
        Sweeps.Engine.Runs.Columnar.ListLevels.Fill(counts, repetitions, definitions);
        return group.WriteAllPartsAsync<double>(field, columns.SampleValues.WrittenMemory, definitions, repetitions, token);
    }

    private static async Task WriteAll(Parquet.ParquetRowGroupWriter group, IReadOnlyList<Parquet.Schema.DataField<double>> fields, double[][] values, int count, CancellationToken token)
    {
        for (var i = 0; i < fields.Count; i++)
        {
            await group.WriteAsync(fields[i], new ReadOnlyMemory<double>(values[i], 0, count), null, null, token);
        }
    }

    private static void AssertSame(ChunkColumns columns, Table table, bool backward)
    {
        var n = columns.Count;
        var prefix = backward ? "backward_" : "";
        Assert.Equal(columns.Regime.Take(n), table[prefix + "regime"].Cast<string>());
        Assert.Equal(columns.Period.Take(n).Cast<object?>(), table[prefix + "period"]);
        Assert.Equal(Bits(columns.Lyapunov[0].Take(n).Cast<object?>()), Bits(table[prefix + "lyapunov_1"]));
        Assert.Equal(Bits(columns.Final[1].Take(n).Cast<object?>()), Bits(table[prefix + "final_y"]));
        var samples = new ChunkColumns.SampleCursor(columns);
        var row = new List<double>();
        var expected = Enumerable.Range(0, n).Select(_ =>
        {
            samples.Next(row);
            return (object?)row.ToArray();
        });
        Assert.Equal(Bits(expected), Bits(table[prefix + "samples"]));
        if (backward)
        {
            return;
        }

        Assert.Equal(columns.Point.Take(n).Cast<object?>(), table["point"]);
        Assert.Equal(Bits(columns.Axis[0].Take(n).Cast<object?>()), Bits(table["a"]));
        Assert.Equal(Bits(columns.PeriodTime.Take(n).Cast<object?>()), Bits(table["period_time"]));
        Assert.Equal(columns.Attractors.Take(n).Cast<object?>(), table["attractors"]);
        Assert.Equal(Bits(columns.Lyapunov[1].Take(n).Cast<object?>()), Bits(table["lyapunov_2"]));
        Assert.Equal(Bits(columns.LyapunovError[0].Take(n).Cast<object?>()), Bits(table["lyapunov_error_1"]));
        Assert.Equal(Bits(columns.Final[0].Take(n).Cast<object?>()), Bits(table["final_x"]));
        Assert.Equal(Bits(columns.Indicators[0].Take(n).Cast<object?>()), Bits(table["zero_one_k"]));
        Assert.Equal(Bits(columns.Indicators[2].Take(n).Cast<object?>()), Bits(table["lz_complexity"]));
        Assert.Equal(columns.Reasons(n), table["reason"].Cast<string?>());
    }
}
