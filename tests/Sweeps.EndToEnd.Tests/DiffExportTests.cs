using System.Globalization;

namespace Sweeps.EndToEnd.Tests;

/// <summary>diff, export and map through the real executable, checked with an independent Parquet reader.</summary>
public sealed class DiffExportTests
{
    private const string Config = """
        [model]
        kind = "map"
        variables = ["x"]
        parameters = ["r", "h"]
        [model.equations]
        x = "r*x*(1 - x) - h*x"
        [initial]
        x = 0.3
        [parameters]
        h = 0.0
        [grid]
        r = { from = 2.8, to = 4.0, steps = 300 }
        [analysis]
        transient = 1000
        measure = 1000
        lyapunov = "largest"
        max_period = 32
        samples = 6
        [output]
        chunk_size = 64
        """;

    [Fact]
    public void Diff_ReportsExactlyThePointsWhoseRegimeChanged()
    {
        using var temp = new TempFolder();
        var config = temp.Write("stock.toml", Config);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", config, "--out", "before").ExitCode);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", config, "--out", "after", "--set", "h=0.05").ExitCode);
        var (code, output, error) = SweepsProcess.Run(temp.Path, "diff", "before", "after", "-o", "changes");
        Assert.True(code == 1, error);
        Assert.Contains("settings changed (same model)", output);

        // The direct comparison, with ParquetSharp: points whose regime differs.
        var before = IndependentReader.ReadRun(Path.Combine(temp.Path, "before")).Rows.ToDictionary(r => (long)r[0]!);
        var after = IndependentReader.ReadRun(Path.Combine(temp.Path, "after")).Rows.ToDictionary(r => (long)r[0]!);
        var regimeChanged = before.Keys.Where(p => (string)before[p][2]! != (string)after[p][2]!).Order().ToList();
        var periodChanged = before.Keys.Where(p => (string)before[p][2]! == (string)after[p][2]! && (int)before[p][3]! != (int)after[p][3]!).ToList();
        Assert.NotEmpty(regimeChanged);
        Assert.Contains($"{regimeChanged.Count:N0} points changed regime", output);
        Assert.Contains($"{periodChanged.Count:N0} points kept their regime but changed period", output);

        using var reader = new ParquetSharp.ParquetFileReader(Path.Combine(temp.Path, "changes", "changed.parquet"));
        using var group = reader.RowGroup(0);
        var rows = (int)group.MetaData.NumRows;
        var points = group.Column(0).LogicalReader<long>().ReadAll(rows);
        var was = group.Column(2).LogicalReader<string>().ReadAll(rows);
        var now = group.Column(3).LogicalReader<string>().ReadAll(rows);
        Assert.Equal(regimeChanged, points.Where((_, i) => was[i] != now[i]).Order().ToList());
        Assert.Equal(regimeChanged.Count + periodChanged.Count, rows);
        Assert.True(File.Exists(Path.Combine(temp.Path, "changes", "changes.png")));
    }

    [Fact]
    public void Diff_SaysNoChangeAndExitsZero_ForIdenticalRuns()
    {
        using var temp = new TempFolder();
        var config = temp.Write("stock.toml", Config);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", config, "--out", "one").ExitCode);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", config, "--out", "two", "--workers", "1").ExitCode);
        var (code, output, _) = SweepsProcess.Run(temp.Path, "diff", "one", "two");
        Assert.Equal(0, code);
        Assert.Contains("no change", output);
        Assert.Contains("same spec", output);
    }

    [Fact]
    public void Diff_RefusesRunsOnDifferentGrids()
    {
        using var temp = new TempFolder();
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", temp.Write("a.toml", Config), "--out", "a").ExitCode);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", temp.Write("b.toml", Config.Replace("steps = 300", "steps = 200")), "--out", "b").ExitCode);
        var (code, _, error) = SweepsProcess.Run(temp.Path, "diff", "a", "b");
        Assert.Equal(2, code);
        Assert.Contains("is on a different grid", Assert.Single(error.Split('\n', StringSplitOptions.RemoveEmptyEntries)));
    }

    [Fact]
    public void ExportCsv_RoundTripsEveryValueOfTheParquetData()
    {
        using var temp = new TempFolder();
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", temp.Write("stock.toml", Config), "--out", "run").ExitCode);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "export", "run", "--format", "csv", "-o", "all.csv").ExitCode);
        var data = IndependentReader.ReadRun(Path.Combine(temp.Path, "run"));
        var lines = File.ReadAllLines(Path.Combine(temp.Path, "all.csv"));
        Assert.Equal(string.Join(",", data.Columns.Select(c => c == "samples.list.element" ? "samples" : c)), lines[0]);
        Assert.Equal(data.Rows.Count, lines.Length - 1);
        var byPoint = data.Rows.ToDictionary(r => (long)r[0]!);
        foreach (var line in lines.Skip(1))
        {
            var fields = SplitCsv(line);
            var row = byPoint[long.Parse(fields[0], CultureInfo.InvariantCulture)];
            for (var c = 1; c < row.Length; c++)
            {
                object? parsed = row[c] switch
                {
                    double => double.Parse(fields[c], CultureInfo.InvariantCulture),
                    int => int.Parse(fields[c], CultureInfo.InvariantCulture),
                    double[] => fields[c].Length == 0 ? Array.Empty<double>() : fields[c].Split(';').Select(v => double.Parse(v, CultureInfo.InvariantCulture)).ToArray(),
                    null => fields[c].Length == 0 ? null : fields[c],
                    _ => fields[c],
                };
                Assert.Equal(row[c], parsed);
            }
        }
    }

    [Fact]
    public void Export_WritesTheFormatTheOutputIsNamedFor_AndRefusesAContradiction()
    {
        using var temp = new TempFolder();
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", temp.Write("stock.toml", Config), "--out", "run").ExitCode);

        // No --format: a .csv name gets CSV (a header line), a .parquet name Parquet (the format's magic bytes).
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "export", "run", "-o", "all.csv").ExitCode);
        Assert.StartsWith("point,", File.ReadLines(Path.Combine(temp.Path, "all.csv")).First(), StringComparison.Ordinal);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "export", "run", "-o", "all.parquet").ExitCode);
        Assert.Equal("PAR1"u8.ToArray(), File.ReadAllBytes(Path.Combine(temp.Path, "all.parquet"))[..4]);

        var (code, _, error) = SweepsProcess.Run(temp.Path, "export", "run", "--format", "parquet", "-o", "other.csv");
        Assert.Equal(2, code);
        Assert.Contains("named for csv", error);
        Assert.False(File.Exists(Path.Combine(temp.Path, "other.csv")));
    }

    [Fact]
    public void ExportParquet_GivesOneFileWithTheSameRows()
    {
        using var temp = new TempFolder();
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", temp.Write("stock.toml", Config), "--out", "run").ExitCode);
        Directory.CreateDirectory(Path.Combine(temp.Path, "merged", "parts"));
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "export", "run", "--format", "parquet", "-o", Path.Combine(temp.Path, "merged", "parts", "all.parquet")).ExitCode);
        var merged = IndependentReader.ReadRun(Path.Combine(temp.Path, "merged"));
        var original = IndependentReader.ReadRun(Path.Combine(temp.Path, "run"));
        Assert.Equal(original.Columns, merged.Columns);
        Assert.Equal(original.Hash(), merged.Hash());
    }

    [Fact]
    public void Run_WritesIndicatorColumns_OnlyWhenAsked()
    {
        using var temp = new TempFolder();
        var config = temp.Write("stock.toml", Config.Replace("samples = 6", "samples = 6\nindicators = true"));
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", config, "--out", "run").ExitCode);
        var data = IndependentReader.ReadRun(Path.Combine(temp.Path, "run"));
        var k = data.Columns.ToList().IndexOf("zero_one_k");
        Assert.True(k > 0, string.Join(",", data.Columns));
        Assert.Contains("permutation_entropy", data.Columns);
        Assert.Contains("lz_complexity", data.Columns);

        // Gottwald & Melbourne (2004): K near 1 where the run found chaos at r = 4.
        var end = data.Rows.Single(r => (long)r[0]! == 299);
        Assert.Equal("chaotic", end[2]);
        Assert.True((double)end[k]! > 0.8);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", temp.Write("plain.toml", Config), "--out", "plain").ExitCode);
        Assert.DoesNotContain("zero_one_k", IndependentReader.ReadRun(Path.Combine(temp.Path, "plain")).Columns);
    }

    [Fact]
    public void Map_WritesAPng_ForEachColouring()
    {
        using var temp = new TempFolder();
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", temp.Write("stock.toml", Config), "--out", "run").ExitCode);
        foreach (var color in new[] { "regime", "period", "lyapunov" })
        {
            var (code, output, error) = SweepsProcess.Run(temp.Path, "map", "run", "--color", color, "-o", $"{color}.png");
            Assert.True(code == 0, error);
            var bytes = File.ReadAllBytes(Path.Combine(temp.Path, $"{color}.png"));
            Assert.Equal(new byte[] { 0x89, 0x50, 0x4E, 0x47 }, bytes[..4]);
            Assert.Contains($"{color}.png", output);
        }
    }

    private static string[] SplitCsv(string line)
    {
        var fields = new List<string>();
        var current = new System.Text.StringBuilder();
        var quoted = false;
        for (var i = 0; i < line.Length; i++)
        {
            var c = line[i];
            if (quoted)
            {
                if (c == '"' && i + 1 < line.Length && line[i + 1] == '"')
                {
                    current.Append('"');
                    i++;
                }
                else if (c == '"')
                {
                    quoted = false;
                }
                else
                {
                    current.Append(c);
                }
            }
            else if (c == '"')
            {
                quoted = true;
            }
            else if (c == ',')
            {
                fields.Add(current.ToString());
                current.Clear();
            }
            else
            {
                current.Append(c);
            }
        }

        fields.Add(current.ToString());
        return fields.ToArray();
    }
}
