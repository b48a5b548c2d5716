using Sweeps.Engine.Config;
using Sweeps.Engine.Execution;
using Sweeps.Engine.Runs;

namespace Sweeps.Maps.Tests;

/// <summary>Small real runs, computed with the chunk runner into a temporary run directory.</summary>
internal static class TestRuns
{
    public static async Task<RunDirectory> CreateAsync(string folder, string config, long chunkSize = 500)
    {
        var spec = SpecReader.Parse(config, "test.toml");
        var (run, _) = RunDirectory.CreateOrResume(Path.Combine(folder, "run"), spec, config, [], chunkSize, TimeProvider.System);
        var context = new RunContext(run);
        foreach (var chunk in run.MissingChunks())
        {
            await ChunkRunner.RunAsync(context, chunk, null, CancellationToken.None);
        }

        return run;
    }

    /// <summary>A cubic map x ↦ a·x − x³ (two attractors ±√(a − 1) for 1 &lt; a &lt; 2) on <paramref name="grid"/>, with more analysis settings if given.</summary>
    public static string Cubic(string grid, string analysis = "") => $"""
        [model]
        kind = "map"
        variables = ["x"]
        parameters = ["a"]
        [model.equations]
        x = "a*x - x^3"
        [grid]
        {grid}
        [analysis]
        transient = 2000
        measure = 500
        max_period = 8
        {analysis}
        """;

    public static string Logistic(string grid) => (grid.Contains("x =", StringComparison.Ordinal) ? "" : "[initial]\nx = 0.3\n") + $"""
        [model]
        kind = "map"
        variables = ["x"]
        parameters = ["r"]
        [model.equations]
        x = "r*x*(1 - x)"
        [grid]
        {grid}
        [analysis]
        transient = 2000
        measure = 1000
        lyapunov = "largest"
        max_period = 32
        """;
}
