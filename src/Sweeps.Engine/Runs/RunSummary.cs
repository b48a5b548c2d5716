using Parquet;

namespace Sweeps.Engine.Runs;

/// <summary>
/// What a run holds, read from its part files alone: points per regime and per period, the range of
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

            await using var reader = await ParquetReader.CreateAsync(path, null, token);
            var fields = reader.Schema.DataFields;
            var regimeField = fields.First(f => f.Name == "regime");
            var periodField = fields.First(f => f.Name == "period");
            var lyapunovField = fields.First(f => f.Name == "lyapunov_1");
            var attractorsField = fields.First(f => f.Name == "attractors");
            var hysteresisField = fields.FirstOrDefault(f => f.Name == "hysteresis");
            for (var g = 0; g < reader.RowGroupCount; g++)
            {
                using var group = reader.OpenRowGroupReader(g);
                var rows = (int)group.RowCount;
                var regime = new string[rows];
                var period = new int[rows];
                var lyapunov = new double[rows];
                await group.ReadAsync(regimeField, regime, null, token);
                await group.ReadAsync<int>(periodField, period, null, token);
                await group.ReadAsync<double>(lyapunovField, lyapunov, null, token);
                var attractors = new int[rows];
                await group.ReadAsync<int>(attractorsField, attractors, null, token);
                multistable += attractors.Count(a => a > 1);
                if (hysteresisField is not null)
                {
                    var flags = new bool[rows];
                    await group.ReadAsync<bool>(hysteresisField, flags, null, token);
                    hysteretic = (hysteretic ?? 0) + flags.Count(f => f);
                }
                for (var i = 0; i < rows; i++)
                {
                    regimes[regime[i]] = regimes.GetValueOrDefault(regime[i]) + 1;
                    if (period[i] > 0)
                    {
                        periods[period[i]] = periods.GetValueOrDefault(period[i]) + 1;
                    }

                    if (!double.IsNaN(lyapunov[i]))
                    {
                        (min, max) = (Math.Min(min, lyapunov[i]), Math.Max(max, lyapunov[i]));
                    }
                }

                done += rows;
            }
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
