using System.Diagnostics;
using System.Text.Json;

namespace Sweeps.Cli.Tests;

public sealed class ProbeCommandTests
{
    private static readonly string FishStock = RepoPaths.Combine("configs", "fish-stock.toml");

    // The period-3 window of the logistic family opens at r = 1 + √8 = 3.8284271 (exact, tangent
    // bifurcation); r = 3.83 lies inside it. The fish-stock example with h = 0 is that family.
    [Fact]
    public void ProbeJson_ReportsPeriodThree_ForFishStockAtR383()
    {
        var run = CliRun.Of("probe", FishStock, "--set", "r=3.83", "--json");
        Assert.Equal(0, run.ExitCode);
        using var json = JsonDocument.Parse(run.Output);
        var root = json.RootElement;
        Assert.Equal("periodic", root.GetProperty("regime").GetString());
        Assert.Equal(3, root.GetProperty("period").GetInt32());
        Assert.Equal(3, root.GetProperty("cycle").GetArrayLength());
        Assert.True(root.GetProperty("lyapunov")[0].GetDouble() < 0);
        Assert.Equal(JsonValueKind.Null, root.GetProperty("reason").ValueKind);
    }

    /// <summary>The probe --json contract: these keys, in this order (a change here is a visible diff).</summary>
    [Fact]
    public void ProbeJson_HasTheContractKeys()
    {
        var run = CliRun.Of("probe", FishStock, "--set", "r=2.8", "--json");
        using var json = JsonDocument.Parse(run.Output);
        string[] keys =
        [
            "kind", "parameters", "initial", "regime", "period", "period_time", "cycle", "lyapunov", "lyapunov_error",
            "lyapunov_sum", "mean_log_det", "final_state", "diverged_at", "reason", "indicators", "fixed_points", "attractors", "notes",
        ];
        Assert.Equal(keys, json.RootElement.EnumerateObject().Select(p => p.Name));
        var point = json.RootElement.GetProperty("fixed_points")[1];
        Assert.Equal(["state", "eigenvalues", "stability", "stable"], point.EnumerateObject().Select(p => p.Name));

        // Exact: the logistic fixed point 1 − 1/r has multiplier 2 − r = −0.8 at r = 2.8, a stable node.
        Assert.Equal(1 - (1 / 2.8), point.GetProperty("state")[0].GetDouble(), 12);
        Assert.Equal("stable node", point.GetProperty("stability").GetString());
        Assert.Equal("fixed-point", json.RootElement.GetProperty("regime").GetString());
    }

    [Fact]
    public void ProbeJson_WritesMinusInfinityAsString_ForSuperstableCycle()
    {
        var config = RepoPaths.Combine("configs", "paced-heart-cell.toml");
        var run = CliRun.Of("probe", config, "--set", "omega=0.5", "--set", "k=1", "--set", "theta=0", "--json");
        using var json = JsonDocument.Parse(run.Output);
        Assert.Equal("-Infinity", json.RootElement.GetProperty("lyapunov")[0].GetString());
        Assert.Equal(2, json.RootElement.GetProperty("period").GetInt32());
    }

    [Fact]
    public void ProbeText_ShowsRegimeCycleAndStability()
    {
        var run = CliRun.Of("probe", FishStock, "--set", "r=3.2");
        Assert.Equal(0, run.ExitCode);
        Assert.Contains("regime        periodic", run.Output);
        Assert.Contains("period        2 iterations", run.Output);
        Assert.Contains("unstable node; eigenvalues -1.2", run.Output);
        Assert.Contains("mean ln|det J|", run.Output);
    }

    [Theory]
    [InlineData("rr=3", "--set rr=3: 'rr' is neither a parameter nor a variable of the model (did you mean 'r'?)")]
    [InlineData("r=abc", "--set r=abc: 'abc' is not a finite number")]
    [InlineData("r", "--set r: expected NAME=VALUE")]
    public void Probe_ExitsWithTwo_WhenSetIsBad(string assignment, string message)
    {
        var run = CliRun.Of("probe", FishStock, "--set", assignment);
        Assert.Equal(2, run.ExitCode);
        Assert.Equal(message, Assert.Single(run.ErrorLines));
    }

    [Fact]
    public void Probe_ExitsWithTwo_WhenConfigIsMissing()
    {
        var run = CliRun.Of("probe", "no-such-file.toml");
        Assert.Equal(2, run.ExitCode);
        Assert.StartsWith("no-such-file.toml: cannot read config:", Assert.Single(run.ErrorLines));
    }

    [Fact]
    public void Cli_ExitsWithTwo_WhenArgumentsAreBad()
    {
        var run = CliRun.Of("probe", FishStock, "--bogus");
        Assert.Equal(2, run.ExitCode);
        Assert.Contains("--bogus", run.Error);
    }

    [Fact]
    public void Help_ListsTheCommands()
    {
        var run = CliRun.Of("--help");
        Assert.Equal(0, run.ExitCode);
        Assert.Contains("probe", run.Output);
        Assert.Contains("check", run.Output);
    }

    /// <summary>The same probe through the real executable, as a user runs it.</summary>
    [Fact]
    public void Executable_ReportsPeriodThree_AsARealProcess()
    {
        var start = new ProcessStartInfo("dotnet", [Path.Combine(AppContext.BaseDirectory, "sweeps.dll"), "probe", FishStock, "--set", "r=3.83", "--json"])
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
        };
        using var process = Process.Start(start)!;
        var output = process.StandardOutput.ReadToEnd();
        process.WaitForExit();
        Assert.Equal(0, process.ExitCode);
        using var json = JsonDocument.Parse(output);
        Assert.Equal(3, json.RootElement.GetProperty("period").GetInt32());
    }

    // Exact: x' = a·x − x³ at a = 1.5 has the superstable fixed points ±√0.5 (f' = 3 − 2a = 0); the map is odd, so a
    // lattice of starts symmetric about 0 sends half to each.
    [Fact]
    public void ProbeJson_ListsEveryAttractorOfTheStarts_WithTheirBasins()
    {
        var config = Path.Combine(Path.GetTempPath(), $"sweeps-probe-{Guid.NewGuid():N}.toml");
        File.WriteAllText(config, """
            [model]
            kind = "map"
            variables = ["x"]
            parameters = ["a"]
            [model.equations]
            x = "a*x - x^3"
            [parameters]
            a = 1.5
            [analysis]
            transient = 500
            measure = 500
            max_period = 8
            [starts]
            x = { from = -1, to = 1, steps = 8 }
            """);
        try
        {
            var run = CliRun.Of("probe", config, "--json");
            Assert.Equal(0, run.ExitCode);
            using var json = JsonDocument.Parse(run.Output);
            var attractors = json.RootElement.GetProperty("attractors").EnumerateArray().ToList();
            Assert.Equal(2, attractors.Count);
            Assert.All(attractors, a => Assert.Equal(0.5, a.GetProperty("basin_fraction").GetDouble()));
            var states = attractors.Select(a => a.GetProperty("state")[0].GetDouble()).Order().ToArray();
            Assert.InRange(states[0], -Math.Sqrt(0.5) - 1e-12, -Math.Sqrt(0.5) + 1e-12);
            Assert.InRange(states[1], Math.Sqrt(0.5) - 1e-12, Math.Sqrt(0.5) + 1e-12);

            // The orbit reported is that of the first start reaching the largest basin: start 0, x = −1.
            Assert.Equal(-1, json.RootElement.GetProperty("initial").GetProperty("x").GetDouble());
        }
        finally
        {
            File.Delete(config);
        }
    }
}
