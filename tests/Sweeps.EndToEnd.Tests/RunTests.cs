using System.Diagnostics;

namespace Sweeps.EndToEnd.Tests;

/// <summary>The sweep pipeline through the real executable, read back with an independent Parquet reader.</summary>
public sealed class RunTests
{
    // A Hénon-type map over a 2-D grid: 24 values of a × 20 initial x = 480 points in chunks of 50.
    private const string TwoAxisConfig = """
        [model]
        kind = "map"
        variables = ["x", "y"]
        parameters = ["a", "b"]
        [model.equations]
        x = "1 - a*x^2 + y"
        y = "b*x"
        [initial]
        y = 0.0
        [parameters]
        b = 0.3
        [grid]
        a = { from = 0.2, to = 2.0, steps = 24 }
        x = { from = -0.5, to = 0.5, steps = 20 }
        [analysis]
        transient = 500
        measure = 1000
        max_period = 32
        samples = 8
        [output]
        chunk_size = 50
        """;

    // A logistic-type map over 24 000 points in chunks of 400: a few seconds on one worker. The transient check
    // keeps it on the scalar path (the block kernel would finish it before a test could stop it).
    private const string LongConfig = """
        [model]
        kind = "map"
        variables = ["x"]
        parameters = ["r"]
        [model.equations]
        x = "r*x*(1 - x)"
        [initial]
        x = 0.3
        [grid]
        r = { from = 2.5, to = 4.0, steps = 24000 }
        [analysis]
        transient = 2000
        measure = 2000
        lyapunov = "largest"
        transient_check = true
        [output]
        chunk_size = 400
        """;

    [Fact]
    public void Run_WritesEveryGridPointExactlyOnce_ReadByAnIndependentReader()
    {
        using var temp = new TempFolder();
        var config = temp.Write("reactor.toml", TwoAxisConfig);
        var (code, output, error) = SweepsProcess.Run(temp.Path, "run", config, "--out", "out");
        Assert.True(code == 0, error);
        Assert.Contains("finished", output);

        var data = IndependentReader.ReadRun(Path.Combine(temp.Path, "out"));
        Assert.Equal(
            [
                "point", "a", "x", "regime", "period", "period_time", "attractors", "lyapunov_1", "lyapunov_2", "lyapunov_error_1", "lyapunov_error_2",
                "final_x", "final_y", "reason", "samples.list.element",
            ],
            data.Columns);
        Assert.Equal(
            ["Int64", "Double", "Double", "ByteArray", "Int32", "Double", "Int32", "Double", "Double", "Double", "Double", "Double", "Double", "ByteArray", "Double"],
            data.Types);
        Assert.Equal(480, data.Rows.Count);
        Assert.Equal(Enumerable.Range(0, 480).Select(i => (long)i), data.Rows.Select(r => (long)r[0]!).Order());
        Assert.Equal(10, Directory.GetFiles(Path.Combine(temp.Path, "out", "parts"), "*.parquet").Length);

        // Row-major: the last axis (x) varies fastest; the grid's end points are exact.
        var last = data.Rows.Single(r => (long)r[0]! == 479);
        Assert.Equal(2.0, (double)last[1]!);
        Assert.Equal(0.5, (double)last[2]!);
        var second = data.Rows.Single(r => (long)r[0]! == 1);
        Assert.Equal(0.2, (double)second[1]!);
        Assert.NotEqual(-0.5, (double)second[2]!);

        // Exact: det J = −b, so every bounded orbit's exponents sum to ln 0.3.
        foreach (var row in data.Rows.Where(r => (string)r[3]! is "chaotic" or "periodic" or "fixed-point"))
        {
            Assert.Equal(Math.Log(0.3), (double)row[7]! + (double)row[8]!, 9);
        }

        var regimes = data.Rows.Select(r => (string)r[3]!).ToHashSet();
        Assert.Subset(new HashSet<string> { "fixed-point", "periodic", "quasi-periodic", "chaotic", "hyperchaotic", "divergent", "unresolved" }, regimes);
        Assert.Contains("chaotic", regimes);
        Assert.Contains("divergent", regimes);
        Assert.All(data.Rows.Where(r => (string)r[3]! == "divergent"), r => Assert.Empty((double[])r[14]!));
        Assert.All(data.Rows.Where(r => (string)r[3]! == "chaotic"), r => Assert.Equal(16, ((double[])r[14]!).Length));

        var metadata = IndependentReader.Metadata(Path.Combine(temp.Path, "out", "parts", "part-000000.parquet"));
        Assert.Matches("^[0-9a-f]{64}$", metadata["sweeps.spec_hash"]);
        Assert.Matches("^[0-9a-f]{64}$", metadata["sweeps.model_hash"]);
        Assert.Equal("x,y", metadata["sweeps.samples_layout"]);

        // The output contract: regime is dictionary-encoded, as the independent reader sees the column chunk.
        var encodings = IndependentReader.Encodings(Path.Combine(temp.Path, "out", "parts", "part-000000.parquet"));
        Assert.Contains(encodings["regime"], e => e is ParquetSharp.Encoding.PlainDictionary or ParquetSharp.Encoding.RleDictionary);
        Assert.Contains(ParquetSharp.Encoding.DeltaBinaryPacked, encodings["point"]);
    }

    // The Van der Pol-type example at μ = 1 has its limit cycle of period 6.6632868593 (standard value, from memory).
    [Fact]
    public void Run_SweepsAFlow_WithPeriodsInTime()
    {
        using var temp = new TempFolder();
        var config = Path.Combine(SweepsProcess.RepoRoot, "configs", "relaxation-oscillator.toml");
        var text = File.ReadAllText(config).Replace("mu = { from = 0.1, to = 5.0, steps = 50 }", "mu = { values = [0.5, 1.0, 2.0] }");
        var (code, _, error) = SweepsProcess.Run(temp.Path, "run", temp.Write("oscillator.toml", text), "--out", "out");
        Assert.True(code == 0, error);
        var data = IndependentReader.ReadRun(Path.Combine(temp.Path, "out"));
        var muOne = data.Rows.Single(r => (double)r[1]! == 1.0);
        Assert.Equal("periodic", muOne[2]);
        Assert.Equal(1, muOne[3]);
        Assert.Equal(6.6632868593, (double)muOne[4]!, 5);
        Assert.All(data.Rows, r => Assert.Equal("periodic", r[2]));
    }

    [Fact]
    public void Run_GivesBitIdenticalResults_WithOneOrTwoWorkers()
    {
        using var temp = new TempFolder();
        var config = temp.Write("reactor.toml", TwoAxisConfig);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", config, "--out", "one", "--workers", "1").ExitCode);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", config, "--out", "two", "--workers", "2").ExitCode);
        Assert.Equal(
            IndependentReader.ReadRun(Path.Combine(temp.Path, "one")).Hash(),
            IndependentReader.ReadRun(Path.Combine(temp.Path, "two")).Hash());
        foreach (var part in Directory.GetFiles(Path.Combine(temp.Path, "one", "parts")))
        {
            Assert.Equal(File.ReadAllBytes(part), File.ReadAllBytes(Path.Combine(temp.Path, "two", "parts", Path.GetFileName(part))));
        }
    }

    [Fact]
    public void Run_ResumesAfterKill_AndMatchesAnUninterruptedRun()
    {
        using var temp = new TempFolder();
        var config = temp.Write("stock.toml", LongConfig);
        var parts = Path.Combine(temp.Path, "killed", "parts");
        using (var process = SweepsProcess.Start(temp.Path, "run", config, "--out", "killed", "--workers", "1"))
        {
            var clock = Stopwatch.StartNew();
            while (!(Directory.Exists(parts) && Directory.GetFiles(parts, "*.parquet").Length >= 3) && clock.Elapsed < TimeSpan.FromMinutes(2))
            {
                Thread.Sleep(20);
            }

            process.Kill(entireProcessTree: true);
            process.WaitForExit();
        }

        var kept = Directory.GetFiles(parts, "*.parquet").Length;
        Assert.InRange(kept, 3, 59);

        var (code, output, error) = SweepsProcess.Run(temp.Path, "run", config, "--out", "killed");
        Assert.True(code == 0, error);
        Assert.Contains("resuming", output);
        Assert.Empty(Directory.GetFiles(parts, "*.tmp-*"));
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", config, "--out", "whole").ExitCode);
        Assert.Equal(
            IndependentReader.ReadRun(Path.Combine(temp.Path, "whole")).Hash(),
            IndependentReader.ReadRun(Path.Combine(temp.Path, "killed")).Hash());
        Assert.Equal(24000, IndependentReader.ReadRun(Path.Combine(temp.Path, "killed")).Rows.Count);
    }

    [Fact]
    public async Task Run_StopsCleanlyOnInterrupt_KeepingFinishedPartsOnly()
    {
        // Ten times the long grid: the interrupt (a `kill` process, slow to start on a busy machine) must arrive while
        // chunks are still queued — with 60 chunks of about a second in all, a loaded CI host once let the run finish first.
        using var temp = new TempFolder();
        var config = temp.Write("stock.toml", LongConfig.Replace("steps = 24000", "steps = 240000", StringComparison.Ordinal));
        var parts = Path.Combine(temp.Path, "stopped", "parts");
        using var process = SweepsProcess.Start(temp.Path, "run", config, "--out", "stopped", "--workers", "2");
        var error = process.StandardError.ReadToEndAsync();
        var clock = Stopwatch.StartNew();
        while (!(Directory.Exists(parts) && Directory.GetFiles(parts, "*.parquet").Length >= 2) && clock.Elapsed < TimeSpan.FromMinutes(2))
        {
            Thread.Sleep(20);
        }

        // What Ctrl-C sends — unless this process ignores SIGINT, as anything a non-interactive shell starts in the
        // background does (POSIX), and hence the run started from it too; then SIGTERM, which takes the same way out.
        var signal = IgnoresInterrupt() ? "-TERM" : "-INT";
        using (var interrupt = Process.Start("kill", [signal, process.Id.ToString(System.Globalization.CultureInfo.InvariantCulture)]))
        {
            interrupt.WaitForExit();
        }

        Assert.True(process.WaitForExit(TimeSpan.FromSeconds(60)), "the run did not stop after SIGINT");
        Assert.Equal(1, process.ExitCode);
        Assert.Contains("run the same command again to resume", await error);
        Assert.Empty(Directory.GetFiles(parts, "*.tmp-*"));
        var kept = Directory.GetFiles(parts, "*.parquet");
        Assert.InRange(kept.Length, 2, 599);
        Assert.All(kept, part => Assert.Equal(400, IndependentReader.ReadRunFile(part)));

        // One start per point: no attractor parts (they would repeat the rows).
        Assert.Empty(Directory.GetFiles(Path.Combine(temp.Path, "stopped", "attractors")));
    }

    /// <summary>Whether SIGINT (bit 1 of the ignored-signals mask in /proc/self/status) is ignored by this process.</summary>
    private static bool IgnoresInterrupt()
    {
        var line = File.ReadLines("/proc/self/status").FirstOrDefault(l => l.StartsWith("SigIgn:", StringComparison.Ordinal));
        return line is not null && (ulong.Parse(line["SigIgn:".Length..].Trim(), System.Globalization.NumberStyles.HexNumber, System.Globalization.CultureInfo.InvariantCulture) & 0x2) != 0;
    }

    [Fact]
    public void Run_RefusesADirectoryOfAnotherSpec_AndLeavesItAlone()
    {
        using var temp = new TempFolder();
        var config = temp.Write("reactor.toml", TwoAxisConfig);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", config, "--out", "out").ExitCode);
        var before = File.ReadAllText(Path.Combine(temp.Path, "out", "run.json"));
        var (code, _, error) = SweepsProcess.Run(temp.Path, "run", config, "--out", "out", "--set", "b=0.2");
        Assert.Equal(2, code);
        Assert.Single(error.Split('\n', StringSplitOptions.RemoveEmptyEntries));
        Assert.Contains("holds a run of a different spec (its settings or grid differ", error);
        Assert.Equal(before, File.ReadAllText(Path.Combine(temp.Path, "out", "run.json")));
    }

    [Fact]
    public void Run_ExitsWithTwoAndWritesNothing_WhenOutputCannotBeCreated()
    {
        using var temp = new TempFolder();
        var config = temp.Write("reactor.toml", TwoAxisConfig);
        var blocker = temp.Write("blocker", "a file, not a folder");
        var (code, output, error) = SweepsProcess.Run(temp.Path, "run", config, "--out", Path.Combine(blocker, "run"));
        Assert.Equal(2, code);
        Assert.Equal("", output);
        Assert.StartsWith($"{Path.Combine(blocker, "run")}: cannot create run directory:", Assert.Single(error.Split('\n', StringSplitOptions.RemoveEmptyEntries)));
    }

    [Fact]
    public void InspectAndStatus_SummariseTheRun_AsJson()
    {
        using var temp = new TempFolder();
        var config = temp.Write("reactor.toml", TwoAxisConfig);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", config, "--out", "out").ExitCode);
        var (code, output, _) = SweepsProcess.Run(temp.Path, "inspect", "out", "--json");
        Assert.Equal(0, code);
        using var json = System.Text.Json.JsonDocument.Parse(output);
        var root = json.RootElement;
        Assert.Equal("finished", root.GetProperty("state").GetString());
        Assert.Equal(480, root.GetProperty("points_done").GetInt64());
        var counted = root.GetProperty("regimes").EnumerateObject().Sum(r => r.Value.GetInt64());
        Assert.Equal(480, counted);
        var data = IndependentReader.ReadRun(Path.Combine(temp.Path, "out"));
        Assert.Equal(data.Rows.Count(r => (string)r[3]! == "chaotic"), root.GetProperty("regimes").GetProperty("chaotic").GetInt64());

        var status = SweepsProcess.Run(temp.Path, "status", "out", "--json");
        using var statusJson = System.Text.Json.JsonDocument.Parse(status.Output);
        Assert.Equal(10, statusJson.RootElement.GetProperty("chunks_done").GetInt64());
        Assert.Equal(0, statusJson.RootElement.GetProperty("missing_chunks").GetArrayLength());
    }
}
