using Sweeps.Engine.Config;
using Sweeps.Engine.Execution;
using Sweeps.Engine.Runs;
using static Sweeps.Engine.Tests.Runs.IndependentParquet;

namespace Sweeps.Engine.Tests.Runs;

/// <summary>
/// A chunk's part written a row group at a time while the chunk is computed: the file holds the rows of the part written
/// whole from the same points (read back through ParquetSharp), its footer the counts of all of them, and a chunk
/// stopped half-way leaves nothing behind. Row groups keep a chunk's columns to a bounded size however many samples a
/// point has.
/// </summary>
public sealed class PartStreamTests
{
    // Common practice: the logistic map from its fixed point through its cycles into chaos, and escapes past r = 4. With
    // 512 samples a row takes 4 KB, so a row group holds about two thousand rows and a chunk of 5000 three row groups.
    private const string Config = """
        [model]
        kind = "map"
        variables = ["x"]
        parameters = ["r"]
        [model.equations]
        x = "r*x*(1 - x)"
        [initial]
        x = 0.3
        [grid]
        r = { from = 2.8, to = 4.1, steps = 5000 }
        [analysis]
        transient = 100
        measure = 512
        lyapunov = "largest"
        max_period = 256
        samples = 512
        """;

    [Theory]
    [InlineData("")]
    [InlineData("transient_check = true")] // no block kernel: point by point
    public async Task Chunk_IsWrittenInRowGroups_HoldingTheRowsOfThePartWrittenWhole(string analysis)
    {
        using var folder = TestRunDirectories.Folder("stream");
        var run = TestRunDirectories.Create(folder, Config + "\n" + analysis, chunkSize: 5000);
        var context = new RunContext(run);
        var group = context.GroupRows;
        Assert.InRange(group, 32, 2499);
        Assert.Equal(5000, await ChunkRunner.RunAsync(context, 0, null, CancellationToken.None));

        var (whole, _) = ChunkRunner.ComputeSample(context.Spec, context.Model, Enumerable.Range(0, 5000).Select(i => (long)i).ToList());
        using var stream = new MemoryStream();
        PartFile.Write(stream, context.Schema, whole, new Dictionary<string, string>());
        var expected = ReadIndependently(stream.ToArray());
        var streamed = ReadIndependently(run.PartPath(0));

        Assert.Equal([5000], expected.GroupRows);
        Assert.Equal([group, group, 5000 - (2 * group)], streamed.GroupRows);
        Assert.Equal(expected.Keys, streamed.Keys);
        foreach (var name in expected.Keys)
        {
            Assert.Equal(Bits(expected[name]), Bits(streamed[name]));
        }

        // The footer's counts are those of all the rows, not of the last row group.
        var tally = PartTally.Of(whole);
        var kept = Assert.Single(context.WrittenTallies).Value;
        Assert.Equal(tally.ToJson(), kept.ToJson());
        var summary = await RunSummary.ReadAsync(run);
        Assert.Equal(5000, summary.PointsDone);
        Assert.Equal(tally.Regimes, summary.Regimes);
        Assert.True(tally.Regimes.Count >= 3, string.Join(", ", tally.Regimes.Keys));
    }

    [Fact]
    public async Task Chunk_StoppedAfterItsFirstRowGroup_LeavesNoFileInTheParts()
    {
        using var folder = TestRunDirectories.Folder("stream");
        var run = TestRunDirectories.Create(folder, Config, chunkSize: 5000);
        var context = new RunContext(run);
        using var stop = new CancellationTokenSource();
        var done = 0L;
        await Assert.ThrowsAnyAsync<OperationCanceledException>(() => ChunkRunner.RunAsync(
            context,
            0,
            points =>
            {
                done += points;
                if (done > context.GroupRows + 100)
                {
                    stop.Cancel();
                }
            },
            stop.Token));

        Assert.True(done > context.GroupRows, $"stopped after {done} points");
        Assert.Empty(Directory.EnumerateFileSystemEntries(run.PartsPath));

        // The columns went back to the run: the chunk computed again writes the whole part.
        Assert.Equal(5000, await ChunkRunner.RunAsync(context, 0, null, CancellationToken.None));
        Assert.Equal(5000, ReadIndependently(run.PartPath(0)).GroupRows.Sum());
    }

    [Fact]
    public async Task Refine_RemovesTheTemporaryPartsAKilledRefineLeftInItsLevel()
    {
        using var folder = TestRunDirectories.Folder("stream");
        var run = TestRunDirectories.Create(folder, Config.Replace("steps = 5000", "steps = 101"), chunkSize: 101);
        await TestRunDirectories.ComputeAsync(run);
        var abandoned = Path.Combine(run.LevelPath(1), "parts", "part-000000.parquet.tmp-0123");
        Directory.CreateDirectory(Path.GetDirectoryName(abandoned)!);
        File.WriteAllBytes(abandoned, [1, 2, 3]);

        var reports = await Engine.Refinement.Refiner.RunAsync(run, 1, 1, null, CancellationToken.None);
        Assert.True(Assert.Single(reports).Points > 0);
        Assert.False(File.Exists(abandoned));
        Assert.NotEmpty(Directory.EnumerateFiles(Path.Combine(run.LevelPath(1), "parts"), "part-*.parquet"));
    }

    [Fact]
    public async Task Export_WritesThePartsRowGroupsInPointOrder_WithTheirRowsAndTheRunsMetadata()
    {
        using var folder = TestRunDirectories.Folder("stream");
        var run = TestRunDirectories.Create(folder, Config.Replace("steps = 5000", "steps = 7000"), chunkSize: 5000);
        var merged = Path.Combine(folder.Path, "all.parquet");

        // A run with no part yet: its columns, no rows.
        Assert.Equal(0, await RunExport.ParquetAsync(run, merged, CancellationToken.None));
        var empty = ReadIndependently(merged);
        Assert.Equal(0, empty.GroupRows.Sum());
        Assert.Contains("samples", empty.Keys);

        await TestRunDirectories.ComputeAsync(run);
        Assert.Equal(7000, await RunExport.ParquetAsync(run, merged, CancellationToken.None));
        var (first, second) = (ReadIndependently(run.PartPath(0)), ReadIndependently(run.PartPath(1)));
        var all = ReadIndependently(merged);
        Assert.Equal(first.GroupRows.Concat(second.GroupRows), all.GroupRows);
        Assert.True(all.GroupRows.Count >= 4, string.Join(", ", all.GroupRows)); // parts of several row groups each
        foreach (var name in first.Keys)
        {
            Assert.Equal(Bits(first[name].Concat(second[name])), Bits(all[name]));
        }

        using (var reader = new ParquetSharp.ParquetFileReader(merged))
        {
            var metadata = reader.FileMetaData.KeyValueMetadata;
            Assert.Equal(run.Manifest.SpecHash, metadata["sweeps.spec_hash"]);
            Assert.DoesNotContain(PartTally.Key, metadata.Keys);
        }

        using var csv = new StringWriter();
        Assert.Equal(7000, await RunExport.CsvAsync(run, csv, CancellationToken.None));
        var lines = csv.ToString().Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(Enumerable.Range(0, 7000).Select(p => p.ToString(System.Globalization.CultureInfo.InvariantCulture)), lines.Skip(1).Select(l => l[..l.IndexOf(',')]));
        var samples = all["samples"].Select(v => ((double[]?)v)?.Length ?? 0).ToList();
        Assert.Contains(512, samples);
        Assert.Equal(samples, lines.Skip(1).Select(l => l[(l.LastIndexOf(',') + 1)..]).Select(f => f.Length == 0 ? 0 : f.Split(';').Length));
    }

    [Fact]
    public async Task ReadEachPart_GivesTablesOfWholeRowGroups_EveryRowOnceAsTheWholeTableHasIt()
    {
        using var folder = TestRunDirectories.Folder("stream");
        var run = TestRunDirectories.Create(folder, Config, chunkSize: 2500);
        var context = await TestRunDirectories.ComputeAsync(run);

        var whole = await RunTable.ReadAsync(run, samples: true);

        // Two parts of two row groups each: a table a part (1.3 million samples' entries each, under the batch), or
        // with a batch smaller than a row group's entries, a table a row group.
        var group = context.GroupRows;
        var parts = new List<RunTable>();
        await foreach (var table in RunTable.ReadEachPartAsync(run, samples: true))
        {
            parts.Add(table);
        }

        Assert.Equal([2500, 2500], parts.Select(t => t.Count));
        var tables = new List<RunTable>();
        await foreach (var table in RunTable.ReadEachLevelPartAsync(run, 0, samples: true, pointsAndSamplesOnly: false, batchSamples: 1))
        {
            tables.Add(table);
        }

        Assert.Equal([group, 2500 - group, group, 2500 - group], tables.Select(t => t.Count));
        Assert.Equal(whole.Point, parts.SelectMany(t => t.Point));
        Assert.Equal(whole.Samples!.All.ToArray(), parts.SelectMany(t => t.Samples!.All.ToArray()));
        Assert.Equal(whole.Point, tables.SelectMany(t => t.Point));
        Assert.Equal(whole.Regime, tables.SelectMany(t => t.Regime));
        Assert.Equal(whole.Lyapunov.Select(BitConverter.DoubleToInt64Bits), tables.SelectMany(t => t.Lyapunov).Select(BitConverter.DoubleToInt64Bits));
        Assert.Equal(whole.Samples!.All.ToArray(), tables.SelectMany(t => t.Samples!.All.ToArray()));
        Assert.Equal(
            Enumerable.Range(0, whole.Count).Select(r => whole.Samples![r].Length),
            tables.SelectMany(t => Enumerable.Range(0, t.Count).Select(r => t.Samples![r].Length)));
    }

    [Fact]
    public async Task ContinuationChunk_IsWrittenInRowGroupsOfWholeLines_HoldingTheRowsOfThePartWrittenWhole()
    {
        // Lines of 250 points along r, both directions; with 512 samples a row group holds a few lines, a chunk twelve.
        var config = Config.Replace("r = { from = 2.8, to = 4.1, steps = 5000 }", "r = { from = 2.8, to = 4.1, steps = 250 }\nx = { from = 0.2, to = 0.7, steps = 12 }\nfollow = \"r\"")
            .Replace("[initial]\nx = 0.3\n", "");
        using var folder = TestRunDirectories.Folder("stream");
        var streamed = TestRunDirectories.Create(Path.Combine(folder.Path, "streamed"), config, chunkSize: 3000);
        var whole = TestRunDirectories.Create(Path.Combine(folder.Path, "whole"), config, chunkSize: 3000);
        var context = new RunContext(streamed);
        Assert.InRange(context.GroupRows, 250, 1500);
        Assert.Equal(0, context.GroupRows % 250);
        Assert.Equal(3000, await ChunkRunner.RunAsync(context, 0, null, CancellationToken.None));
        Assert.Equal(3000, await ChunkRunner.RunAsync(new RunContext(whole) { GroupRows = int.MaxValue }, 0, null, CancellationToken.None));

        var (a, b) = (ReadIndependently(streamed.PartPath(0)), ReadIndependently(whole.PartPath(0)));
        Assert.Equal([3000], b.GroupRows);
        Assert.Equal(Enumerable.Repeat(context.GroupRows, 3000 / context.GroupRows), a.GroupRows.Take(3000 / context.GroupRows));
        Assert.Equal(3000, a.GroupRows.Sum());
        Assert.Contains("backward_samples", a.Keys);
        foreach (var name in b.Keys)
        {
            Assert.Equal(Bits(b[name]), Bits(a[name]));
        }

        Assert.Equal(File.ReadAllBytes(whole.AttractorPartPath(0)), File.ReadAllBytes(streamed.AttractorPartPath(0)));
        Assert.Equal((await RunSummary.ReadAsync(whole)).HysteresisPoints, (await RunSummary.ReadAsync(streamed)).HysteresisPoints);
        Assert.Equal(Bits(b["hysteresis"]).Count(h => h == "True"), (await RunSummary.ReadAsync(streamed)).HysteresisPoints);
    }

    [Theory]
    [InlineData(1, 8, 64, false)]
    [InlineData(1, 512, 256, false)]
    [InlineData(3, 4096, 2048, false)]
    [InlineData(2, 0, 16, false)]
    [InlineData(1, 8, 64, true)]
    [InlineData(2, 1024, 512, true)]
    public void GroupRows_KeepARowGroupsColumnsWithinTheirBudget_InWholeBlocksOrLines(int variables, int samples, int maxPeriod, bool follow)
    {
        var names = new[] { "x", "y", "z" }.Take(variables).ToArray();
        var spec = SpecReader.Parse(
            $$"""
            [model]
            kind = "map"
            variables = [{{string.Join(", ", names.Select(n => $"\"{n}\""))}}]
            parameters = ["r"]
            [model.equations]
            {{string.Join("\n", names.Select(n => $"{n} = \"r*{n}*(1 - {n})\""))}}
            [initial]
            {{string.Join("\n", names.Select(n => $"{n} = 0.3"))}}
            [grid]
            r = { from = 2.8, to = 4.1, steps = 100 }
            {{(follow ? "follow = \"r\"" : "")}}
            [analysis]
            measure = {{2 * maxPeriod}}
            max_period = {{maxPeriod}}
            samples = {{samples}}
            """,
            "groups.toml");
        var rows = ChunkColumns.GroupRows(spec);

        // Whole blocks of 32 points (the one-variable map kernel's; the other block analyzers take 4), never fewer — or
        // whole lines of a continuation sweep (100 points here).
        var unit = follow ? 100 : 32;
        Assert.Equal(0, rows % unit);
        Assert.InRange(rows, unit, ChunkColumns.MaxGroupRows);

        // What the columns of a row group really take, measured by the collector.
        var before = GC.GetAllocatedBytesForCurrentThread();
        var columns = ChunkColumns.For(spec, rows, branches: follow);
        var bytes = GC.GetAllocatedBytesForCurrentThread() - before;
        Assert.Equal(rows, columns.Capacity);
        Assert.True(bytes <= ChunkColumns.GroupBytes, $"{rows} rows take {bytes} bytes");

        // As many rows as the budget allows: either the most a group holds, or another block (line) would not fit.
        // (A row's size is estimated from the column types: within a few per cent of what the collector counts.)
        if (rows + unit <= ChunkColumns.MaxGroupRows)
        {
            Assert.True(bytes * (rows + unit) / rows > 0.95 * ChunkColumns.GroupBytes, $"{rows} rows take {bytes} bytes");
        }
    }
}
