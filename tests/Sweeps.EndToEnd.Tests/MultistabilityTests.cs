namespace Sweeps.EndToEnd.Tests;

/// <summary>Several starts per point through the real executable: the attractors table, read by an independent reader.</summary>
public sealed class MultistabilityTests
{
    // The odd cubic map x' = a·x − x³ over three values of a in (1, 2), sixteen lattice starts on [−1, 1] per point.
    private const string CubicConfig = """
        [model]
        kind = "map"
        variables = ["x"]
        parameters = ["a"]
        [model.equations]
        x = "a*x - x^3"
        [initial]
        x = 0.3
        [grid]
        a = { values = [1.2, 1.5, 1.8] }
        [analysis]
        transient = 2000
        measure = 1000
        max_period = 16
        [starts]
        x = { from = -1, to = 1, steps = 16 }
        """;

    // A driven double well (x'' + δx' − x + x³ = F cos ωt): random starts in a box, seeded by the point index.
    private const string DrivenWellConfig = """
        [model]
        kind = "flow"
        variables = ["x", "v"]
        parameters = ["delta", "force", "omega"]
        forcing_period = 5.235987755982989
        [model.equations]
        x = "v"
        v = "-delta*v + x - x^3 + force*cos(omega*t)"
        [initial]
        x = 1
        v = 0
        [parameters]
        delta = 0.3
        omega = 1.2
        [grid]
        force = { from = 0.0, to = 0.1, steps = 3 }
        [analysis]
        transient = 100
        measure = 100
        starts = 6
        lyapunov = "largest"
        [starts]
        x = { from = -1.5, to = 1.5 }
        v = { from = -1, to = 1 }
        seed = 11
        [integrator]
        method = "rk4"
        step = 0.02
        [output]
        chunk_size = 1
        """;

    // Exact: x' = a·x − x³ has the fixed points ±√(a − 1), stable for 1 < a < 2 (f' = 3 − 2a); the map is odd and
    // orbits from (0, 1] stay positive, so a lattice symmetric about 0 sends half its starts to each.
    [Fact]
    public void Run_WithLatticeStarts_FindsBothFixedPointsAtEveryPoint_WithHalfTheBasinEach()
    {
        using var temp = new TempFolder();
        var config = temp.Write("cubic.toml", CubicConfig);
        var (code, _, error) = SweepsProcess.Run(temp.Path, "run", config, "--out", "out");
        Assert.True(code == 0, error);

        var points = IndependentReader.ReadRun(Path.Combine(temp.Path, "out"));
        var count = points.Columns.ToList().IndexOf("attractors");
        Assert.All(points.Rows, r => Assert.Equal(2, (int)r[count]!));

        var table = IndependentReader.ReadRun(Path.Combine(temp.Path, "out"), "attractors");
        Assert.Equal(
            [
                "point", "attractor", "regime", "period", "period_time", "basin_fraction", "start_count", "first_start",
                "lyapunov_1", "lyapunov_error_1", "state_x", "low_x", "high_x", "reason",
            ],
            table.Columns);
        Assert.Equal(6, table.Rows.Count);
        double[] a = [1.2, 1.5, 1.8];
        foreach (var point in Enumerable.Range(0, 3))
        {
            var rows = table.Rows.Where(r => (long)r[0]! == point).ToList();
            Assert.Equal([0, 1], rows.Select(r => (int)r[1]!));
            Assert.All(rows, r => Assert.Equal("fixed-point", r[2]));
            Assert.All(rows, r => Assert.Equal(0.5, (double)r[5]!));
            Assert.Equal(16, rows.Sum(r => (int)r[6]!));
            var states = rows.Select(r => (double)r[10]!).Order().ToArray();
            var root = Math.Sqrt(a[point] - 1);
            Assert.InRange(states[0], -root - 1e-9, -root + 1e-9);
            Assert.InRange(states[1], root - 1e-9, root + 1e-9);
        }
    }

    // Common practice: random starts depend on the seed and the point index only, so the worker count and the
    // chunking cannot change them; every point's basin fractions sum to 1.
    [Fact]
    public void Run_WithRandomStarts_IsTheSameOnOneAndTwoWorkers_AndFractionsSumToOne()
    {
        using var temp = new TempFolder();
        var config = temp.Write("well.toml", DrivenWellConfig);
        var one = SweepsProcess.Run(temp.Path, "run", config, "--out", "one", "--workers", "1");
        Assert.True(one.ExitCode == 0, one.Error);
        var two = SweepsProcess.Run(temp.Path, "run", config, "--out", "two", "--workers", "2");
        Assert.True(two.ExitCode == 0, two.Error);

        var first = IndependentReader.ReadRun(Path.Combine(temp.Path, "one"), "attractors");
        var second = IndependentReader.ReadRun(Path.Combine(temp.Path, "two"), "attractors");
        Assert.Equal(first.Hash(), second.Hash());
        foreach (var point in first.Rows.GroupBy(r => (long)r[0]!))
        {
            Assert.Equal(1.0, point.Sum(r => (double)r[5]!), 12);
            Assert.Equal(6, point.Sum(r => (int)r[6]!));
        }

        // Unforced (F = 0) the damped double well settles in one of its two wells (±1, 0): both are found, each a
        // response of period 1 of the stroboscopic map (a forced model is sampled once per forcing period).
        var unforced = first.Rows.Where(r => (long)r[0]! == 0).ToList();
        Assert.Equal(2, unforced.Count);
        Assert.All(unforced, r => Assert.Equal(("periodic", 1), ((string)r[2]!, (int)r[3]!)));
        var x = first.Columns.ToList().IndexOf("state_x");
        Assert.Equal([-1.0, 1.0], unforced.Select(r => Math.Round((double)r[x]!, 6)).Order());
    }
}
