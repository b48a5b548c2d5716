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
    public static async Task<RunSummary> ReadAsync(RunDirectory run, CancellationToken token = default)
    {
        var regimes = new SortedDictionary<string, long>(StringComparer.Ordinal);
        var periods = new SortedDictionary<int, long>();
        var (min, max) = (double.PositiveInfinity, double.NegativeInfinity);
        var done = 0L;
        var multistable = 0L;
        long? hysteretic = null;
        var missing = new List<long>();
        for (var chunk = 0L; chunk < run.Manifest.ChunkCount; chunk++)
        {
            var path = run.PartPath(chunk);
            if (!File.Exists(path))
            {
                missing.Add(chunk);
                continue;
            }

            // Every part's footer carries its counts (PartTally): no rows to read.
            await using var reader = await ParquetReader.CreateAsync(path, null, token);
            var tally = PartTally.FromJson(reader.CustomMetadata.GetValueOrDefault(PartTally.Key))
                ?? throw Config.ConfigException.Single(path, "a part file without its counts (not written by this version of Sweeps)");
            foreach (var (regime, count) in tally.Regimes)
            {
                regimes[regime] = regimes.GetValueOrDefault(regime) + count;
            }

            foreach (var (period, count) in tally.Periods)
            {
                periods[period] = periods.GetValueOrDefault(period) + count;
            }

            (min, max) = (Math.Min(min, tally.LargestExponentMin), Math.Max(max, tally.LargestExponentMax));
            multistable += tally.Multistable;
            hysteretic = tally.Hysteresis is { } flagged ? (hysteretic ?? 0) + flagged : hysteretic;
            done += tally.Rows;
        }

        return new RunSummary(
            run.Manifest.Points,
            done,
            run.Manifest.ChunkCount,
            run.Manifest.ChunkCount - missing.Count,
            missing,
            regimes,
            periods,
            min <= max ? min : double.NaN,
            min <= max ? max : double.NaN,
            missing.Count == 0 ? RunManifest.Complete : "incomplete",
            multistable,
            hysteretic);
    }
}
