using Sweeps.Engine.Config;
using Sweeps.Engine.Planning;
using Sweeps.Engine.Runs;
using Sweeps.Engine.Specs;

namespace Sweeps.Cli.Commands;

/// <summary>
/// What run and submit share: the spec with its --set overrides, the run directory it goes to, and
/// the chunk size — the existing run's when resuming, else the config's, else one planned from a timing.
/// </summary>
internal sealed record SweepSetup(SweepSpec Spec, string ConfigText, IReadOnlyList<string> Overrides, string Directory, long ChunkSize, CostEstimate? Estimate)
{
    public static SweepSetup Prepare(string configPath, IReadOnlyList<string> overrides, string? outDir, int workers)
    {
        var spec = PointOverrides.ApplyToSpec(SpecReader.Load(configPath), overrides);
        var directory = outDir ?? spec.OutputDirectory ?? Path.Combine("runs", Path.GetFileNameWithoutExtension(configPath));
        var text = File.ReadAllText(configPath);
        if (File.Exists(Path.Combine(directory, "run.json")))
        {
            return new SweepSetup(spec, text, overrides, directory, RunDirectory.Open(directory).Manifest.ChunkSize, null);
        }

        var estimate = CostEstimate.Measure(spec);
        var plan = ChunkPlan.Of(spec, estimate.SecondsPerPoint, workers);
        return new SweepSetup(spec, text, overrides, directory, plan.ChunkSize, estimate);
    }

    public static int Workers(int? requested)
    {
        var count = requested ?? Environment.ProcessorCount;
        return count is >= 1 and <= 1024 ? count : throw ConfigException.Single("--workers", $"{count} is out of range (1 to 1024)");
    }
}
