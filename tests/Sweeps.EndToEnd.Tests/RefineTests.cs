namespace Sweeps.EndToEnd.Tests;

/// <summary>Boundary refinement through the real executable, checked against a uniform fine run read by an independent reader.</summary>
public sealed class RefineTests
{
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
        r = { from = 2.8, to = 3.56, steps = 77 }
        [analysis]
        transient = 4000
        measure = 2000
        lyapunov = "largest"
        max_period = 32
        """;

    // The first period doublings of the logistic family: r1 = 3 and r2 = 1 + √6 exactly (f'(x*) = 2 − r and
    // (f²)' = 4 + 2r − r² reach −1), r3 = 3.5440903 (published value, from memory). The grid of spacing 0.01
    // refined four times (spacing 0.000625) must put its new points only around them, find each boundary
    // where a uniform run at the finest spacing finds it, and compute a small share of that run's points.
    [Fact]
    public void Refine_AddsPointsOnlyAroundThePeriodDoublings_AndAgreesWithAUniformFineRun()
    {
        using var temp = new TempFolder();
        var config = temp.Write("logistic.toml", Config);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", config, "--out", "coarse").ExitCode);
        var (code, output, error) = SweepsProcess.Run(temp.Path, "refine", "coarse", "--levels", "4");
        Assert.True(code == 0, error);
        Assert.Contains("level 4", output);

        double[] doublings = [3.0, 1 + Math.Sqrt(6), 3.5440903];
        var coarse = Read(Path.Combine(temp.Path, "coarse"), "parts");
        var levels = Enumerable.Range(1, 4).Select(l => Read(Path.Combine(temp.Path, "coarse"), Path.Combine("levels", l.ToString(System.Globalization.CultureInfo.InvariantCulture), "parts"))).ToList();
        Assert.All(levels, level => Assert.NotEmpty(level));
        Assert.All(levels.SelectMany(l => l), p => Assert.True(doublings.Any(r => Math.Abs(p.R - r) < 0.01), $"point added at r = {p.R}, away from every doubling"));

        // Boundaries: neighbours (in r) that differ in regime or period. At the finest spacing the refined
        // set's boundaries must be exactly the uniform fine run's (same r values: the lattices coincide bit for bit).
        var refined = coarse.Concat(levels.SelectMany(l => l)).OrderBy(p => p.R).ToList();
        var fine = Read(RunFine(temp), "parts").OrderBy(p => p.R).ToList();
        Assert.Equal(76 * 16 + 1, fine.Count);
        var spacing = 0.76 / (76 * 16);
        var refinedBoundaries = Boundaries(refined).Where(b => b.High - b.Low < 1.5 * spacing).ToList();
        var fineBoundaries = Boundaries(fine).ToList();
        Assert.Equal(fineBoundaries, refinedBoundaries);
        Assert.All(doublings, r => Assert.Contains(fineBoundaries, b => Math.Abs(((b.Low + b.High) / 2) - r) < 0.002));
        Assert.True(refined.Count < 0.15 * fine.Count, $"{refined.Count} points refined vs {fine.Count} uniform");
        Assert.Contains($"{refined.Count:N0} points computed where a uniform grid at the finest spacing has {fine.Count:N0}", output);
    }

    private static string RunFine(TempFolder temp)
    {
        var config = temp.Write("fine.toml", Config.Replace("steps = 77", "steps = 1217", StringComparison.Ordinal));
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", config, "--out", "fine").ExitCode);
        return Path.Combine(temp.Path, "fine");
    }

    private static List<(double R, string Regime, int Period)> Read(string run, string table) =>
        IndependentReader.ReadRun(run, table).Rows.Select(r => ((double)r[1]!, (string)r[2]!, (int)r[3]!)).ToList();

    private static IEnumerable<(double Low, double High, string From, string To)> Boundaries(List<(double R, string Regime, int Period)> points)
    {
        for (var i = 1; i < points.Count; i++)
        {
            if (points[i].Regime != points[i - 1].Regime || points[i].Period != points[i - 1].Period)
            {
                yield return (points[i - 1].R, points[i].R, $"{points[i - 1].Regime} {points[i - 1].Period}", $"{points[i].Regime} {points[i].Period}");
            }
        }
    }
}
