using Parquet;

namespace Sweeps.Engine.Runs;

/// <summary>
/// What a run holds, read from the footers of its part files alone: points per regime and per period, the range of
/// the largest exponent, points with several attractors, points flagged as hysteretic (continuation
/// sweeps; null otherwise), and which chunks are still missing.
/// </summary>
public sealed record RunSummary(
    long Points,
    long PointsDone,
    long Chunks,
    long ChunksDone,
    IReadOnlyList<long> MissingChunks,
    IReadOnlyDictionary<string, long> Regimes,
    IReadOnlyDictionary<int, long> Periods,
    double LargestExponentMin,
    double LargestExponentMax,
    string State,
    long MultistablePoints = 0,
    long? HysteresisPoints = null)
{
    public static Task<RunSummary> ReadAsync(RunDirectory run, CancellationToken token = default) => ReadAsync(run, null, token);

    /// <summary>
    /// The summary of the context's run, taking the counts of the parts this process wrote from the context and reading
    /// only the other parts' footers (a run resumed, or parts another process wrote).
    /// </summary>
    public static Task<RunSummary> ReadAsync(Execution.RunContext context, CancellationToken token = default) =>
        ReadAsync(context.Run, context.WrittenTallies, token);

    private static async Task<RunSummary> ReadAsync(RunDirectory run, IReadOnlyDictionary<long, PartTally>? known, CancellationToken token)
    {
        PartTally? total = null;
        var missing = new List<long>();
        for (var chunk = 0L; chunk < run.Manifest.ChunkCount; chunk++)
        {
            var path = run.PartPath(chunk);
            if (!File.Exists(path))
            {
                missing.Add(chunk);
                continue;
            }

            var tally = known?.GetValueOrDefault(chunk) ?? await TallyAsync(path, token);
            total = total?.Plus(tally) ?? tally;
        }

        var (min, max) = total is null ? (double.PositiveInfinity, double.NegativeInfinity) : (total.LargestExponentMin, total.LargestExponentMax);
        return new RunSummary(
            run.Manifest.Points,
            total?.Rows ?? 0,
            run.Manifest.ChunkCount,
            run.Manifest.ChunkCount - missing.Count,
            missing,
            total?.Regimes ?? new SortedDictionary<string, long>(StringComparer.Ordinal),
            total?.Periods ?? new SortedDictionary<int, long>(),
            min <= max ? min : double.NaN,
            min <= max ? max : double.NaN,
            missing.Count == 0 ? RunManifest.Complete : "incomplete",
            total?.Multistable ?? 0,
            total?.Hysteresis);
    }

    /// <summary>A part's counts from its footer (<see cref="PartTally"/>): no rows to read.</summary>
    private static async Task<PartTally> TallyAsync(string path, CancellationToken token)
    {
        await using var reader = await ParquetReader.CreateAsync(path, null, token);
        return PartTally.FromJson(reader.CustomMetadata.GetValueOrDefault(PartTally.Key))
            ?? throw Config.ConfigException.Single(path, "a part file without its counts (not written by this version of Sweeps)");
    }
}
