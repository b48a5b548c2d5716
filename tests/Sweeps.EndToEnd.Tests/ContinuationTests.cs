namespace Sweeps.EndToEnd.Tests;

/// <summary>Continuation sweeps (grid.follow) through the real executable, read back by an independent reader.</summary>
public sealed class ContinuationTests
{
    // x' = r + s·x − x³ swept in r (followed) for two values of s; r is the first axis, so a line along it
    // strides through the row-major point index. chunk_size 50 is rounded up to whole lines of 121.
    private const string FoldConfig = """
        [model]
        kind = "flow"
        variables = ["x"]
        parameters = ["r", "s"]
        [model.equations]
        x = "r + s*x - x^3"
        [initial]
        x = -1.5
        [grid]
        r = { from = -0.6, to = 0.6, steps = 121 }
        s = { values = [1.0, 0.8] }
        follow = "r"
        [analysis]
        transient = 100
        measure = 20
        [integrator]
        method = "rk4"
        step = 0.01
        [output]
        chunk_size = 50
        """;

    // Exact: x' = r + s·x − x³ has three equilibria for |r| < (2s/3)·√(s/3) and one outside; the folds are where
    // r = x³ − s·x has dr/dx = 0, x = ±√(s/3). For s = 1 that is r = ±2/(3√3) = ±0.3849, for s = 0.8 r = ±0.2754 (no grid
    // point within 0.005 of a fold, where convergence slows down).
    // Swept up in r the state stays on the lower branch until the upper fold, swept down on the upper one until
    // the lower fold, so the two directions differ exactly inside the bistable interval.
    [Fact]
    public void Run_FlagsExactlyTheBistableInterval_BetweenTheAnalyticFolds()
    {
        using var temp = new TempFolder();
        var (code, output, error) = SweepsProcess.Run(temp.Path, "run", temp.Write("fold.toml", FoldConfig), "--out", "out");
        Assert.True(code == 0, error);
        Assert.Contains("in 2 chunks of up to 121", output);

        var data = IndependentReader.ReadRun(Path.Combine(temp.Path, "out"));
        var columns = data.Columns.ToList();
        Assert.Equal(
            ["hysteresis", "backward_regime", "backward_period", "backward_lyapunov_1", "backward_final_x", "backward_samples.list.element"],
            columns.Skip(columns.IndexOf("samples.list.element") + 1));
        var (r, s, flag, final, backward) = (columns.IndexOf("r"), columns.IndexOf("s"), columns.IndexOf("hysteresis"), columns.IndexOf("final_x"), columns.IndexOf("backward_final_x"));
        Assert.Equal(242, data.Rows.Count);
        foreach (var row in data.Rows)
        {
            var (rv, sv) = ((double)row[r]!, (double)row[s]!);
            var fold = 2 * sv / 3 * Math.Sqrt(sv / 3);
            Assert.True((bool)row[flag]! == Math.Abs(rv) < fold, $"r = {rv}, s = {sv}: hysteresis {(bool)row[flag]!}, fold at ±{fold}");
            Assert.Equal("fixed-point", row[columns.IndexOf("regime")]);
            Assert.Equal("fixed-point", row[columns.IndexOf("backward_regime")]);

            // Inside the interval the forward sweep sits on the lower branch and the backward one on the upper.
            if (Math.Abs(rv) < fold)
            {
                Assert.True((double)row[final]! < -Math.Sqrt(sv / 3) && (double)row[backward]! > Math.Sqrt(sv / 3));
            }
        }

        Assert.Equal(77 + 55, data.Rows.Count(row => (bool)row[flag]!));
        Assert.Contains("hysteresis    132 points", output);

        // Every point has one attractor row per distinct branch outcome: two inside the interval, one outside.
        var attractors = IndependentReader.ReadRun(Path.Combine(temp.Path, "out"), "attractors");
        Assert.Equal(242 + 132, attractors.Rows.Count);
    }

    [Fact]
    public void Map_DrawsBothBranches_ForAContinuationSweep()
    {
        using var temp = new TempFolder();
        var config = FoldConfig.Replace("s = { values = [1.0, 0.8] }", "", StringComparison.Ordinal).Replace("[initial]", "[parameters]\ns = 1.0\n[initial]", StringComparison.Ordinal);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", temp.Write("fold.toml", config), "--out", "out").ExitCode);
        var (code, _, error) = SweepsProcess.Run(temp.Path, "map", "out", "-o", "fold.png");
        Assert.True(code == 0, error);
        Assert.True(new FileInfo(Path.Combine(temp.Path, "fold.png")).Length > 1000);
    }
}
