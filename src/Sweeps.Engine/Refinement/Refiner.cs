using System.Text.Json;
using Sweeps.Engine.Config;
using Sweeps.Engine.Execution;
using Sweeps.Engine.Runs;

namespace Sweeps.Engine.Refinement;

/// <summary>What one refinement level added.</summary>
/// <param name="Level">1 for half the grid spacing, 2 for a quarter, …</param>
/// <param name="Points">Points added at this level.</param>
/// <param name="Reused">Whether the level was already on disk from an earlier refine.</param>
public sealed record LevelReport(int Level, long Points, bool Reused);

/// <summary>
/// Boundary refinement of a finished run, level by level, on this machine: each level's points
/// (<see cref="RefinementPlan"/>) are computed in chunks on <c>workers</c> threads and written as part files
/// under <c>levels/ℓ/</c>; a finished level gets a <c>level.json</c>. Levels already finished are read back,
/// not recomputed, and an interrupted level resumes from its finished parts — its plan is deterministic.
/// </summary>
public static class Refiner
{
    /// <summary>A level is cut into about this many parts (fewer when small, more when a part would exceed the run's chunk size).</summary>
    private const int PartsPerLevel = 16;

    public static async Task<IReadOnlyList<LevelReport>> RunAsync(RunDirectory run, int levels, int workers, Action<long>? progress, CancellationToken token)
    {
        var context = new RunContext(run);
        var spec = context.Spec;
        var grid = spec.Grid;
        if (grid.Follow is not null)
        {
            throw ConfigException.Single(run.FullPath, "a continuation sweep cannot be refined (its lines are computed in order)");
        }

        if (!Enumerable.Range(0, grid.Axes.Count).Any(a => LevelGrid.Refinable(grid, a)))
        {
            throw ConfigException.Single(run.FullPath, "no axis to refine (only axes given as from/to/steps with at least two steps are subdivided)");
        }

        if (run.MissingChunks().Count > 0)
        {
            throw ConfigException.Single(run.FullPath, "the run is not finished; finish it (run or worker) before refining");
        }

        // The run is read part by part into the plan (four bytes a point), never as a whole table; every one of its
        // points seeds the first level.
        var plan = new RefinementPlan(grid, levels);
        await foreach (var part in RunTable.ReadEachPartAsync(run, samples: false, token: token))
        {
            Add(plan, 0, part);
        }

        IEnumerable<long>? seeds = null;
        var reports = new List<LevelReport>();
        for (var level = 1; level <= levels; level++)
        {
            var folder = run.LevelPath(level);
            var finished = File.Exists(Path.Combine(folder, "level.json"));
            var points = plan.Next(level, seeds);
            if (!finished)
            {
                await ComputeAsync(context, spec with { Grid = LevelGrid.At(grid, level) }, points, folder, workers, progress, token);
                await File.WriteAllTextAsync(Path.Combine(folder, "level.json"), JsonSerializer.Serialize(new { level, points = points.LongLength }), token);
            }

            var computed = await RunTable.ReadLevelAsync(run, level, samples: false, token);
            Add(plan, level, computed);
            reports.Add(new LevelReport(level, points.LongLength, finished));
            seeds = points;
            if (points.Length == 0)
            {
                break;
            }
        }

        return reports;
    }

    private static void Add(RefinementPlan plan, int level, RunTable table)
    {
        for (var row = 0; row < table.Count; row++)
        {
            plan.Add(level, table.Point[row], table.Regime[row], table.Period[row]);
        }
    }

    private static async Task ComputeAsync(
        RunContext context, Specs.SweepSpec levelSpec, long[] points, string folder, int workers, Action<long>? progress, CancellationToken token)
    {
        string[] folders = [Path.Combine(folder, "parts"), Path.Combine(folder, "attractors")];
        foreach (var created in folders)
        {
            Directory.CreateDirectory(created);
        }

        // Refine computes its levels in this process alone: what a killed refine was writing is abandoned.
        RunDirectory.RemoveAbandonedParts(folders);

        // The split depends on the level's points alone (never on the workers), so a resumed level finds its parts.
        var size = (int)Math.Clamp((points.Length + PartsPerLevel - 1) / PartsPerLevel, 1, context.Run.Manifest.ChunkSize);
        var parts = Enumerable.Range(0, (points.Length + size - 1) / size).ToArray();
        var options = new ParallelOptions { MaxDegreeOfParallelism = workers, CancellationToken = token };
        await Parallel.ForEachAsync(parts, options, async (part, cancel) =>
        {
            var chunk = points.AsSpan(part * size, Math.Min(size, points.Length - (part * size))).ToArray();
            await ChunkRunner.RunPointsAsync(context, levelSpec, chunk, folder, part, cancel);
            progress?.Invoke(chunk.Length);
        });
    }
}
