using Sweeps.Core.Models;
using Sweeps.Engine.Config;
using Sweeps.Engine.Planning;
using Sweeps.Engine.Probing;
using Sweeps.Engine.Runs;
using Sweeps.Engine.Specs;

namespace Sweeps.Cli.Commands;

/// <summary>
/// What run and submit share: the spec with its --set overrides, the run directory it goes to, and
/// the chunk size — the existing run's when resuming, else the config's, else one planned from a timing.
/// </summary>
internal sealed record SweepSetup(SweepSpec Spec, Model Model, string ConfigText, IReadOnlyList<string> Overrides, string Directory, long ChunkSize, CostEstimate? Estimate)
{
    /// <summary>The setup of a sweep for a shared queue (chunks of at least <see cref="ChunkPlan.MinSeconds"/>).</summary>
    public static SweepSetup Prepare(string configPath, IReadOnlyList<string> overrides, string? outDir, int workers) =>
        Prepare(Load(configPath, overrides), configPath, overrides, outDir, workers, ChunkPlan.MinSeconds);

    /// <summary>The config with its --set overrides applied (validated: bad input throws here).</summary>
    public static SweepSpec Load(string configPath, IReadOnlyList<string> overrides) =>
        PointOverrides.ApplyToSpec(SpecReader.Load(configPath), overrides);

    /// <summary>The setup of <paramref name="spec"/>; a new run's chunks get at least <paramref name="minSeconds"/> of compute each.</summary>
    public static SweepSetup Prepare(SweepSpec spec, string configPath, IReadOnlyList<string> overrides, string? outDir, int workers, double minSeconds)
    {
        var directory = outDir ?? spec.OutputDirectory ?? Path.Combine("runs", Path.GetFileNameWithoutExtension(configPath));
        var text = File.ReadAllText(configPath);
        var model = ModelFactory.Build(spec);
        if (File.Exists(Path.Combine(directory, "run.json")))
        {
            return new SweepSetup(spec, model, text, overrides, directory, RunDirectory.Open(directory).Manifest.ChunkSize, null);
        }

        var estimate = CostEstimate.Measure(spec, model, quick: true);
        var plan = ChunkPlan.Of(spec, estimate.SecondsPerPoint, workers, estimate.BlockSize, minSeconds);
        return new SweepSetup(spec, model, text, overrides, directory, plan.ChunkSize, estimate);
    }

    public static int Workers(int? requested)
    {
        var count = requested ?? Environment.ProcessorCount;
        return count is >= 1 and <= 1024 ? count : throw ConfigException.Single("--workers", $"{count} is out of range (1 to 1024)");
    }
}
