using System.Globalization;
using System.Runtime.InteropServices;
using System.Text.Json.Nodes;

namespace Sweeps.Engine.Runs;

/// <summary>
/// A part's counts, stored in its footer (metadata key <see cref="Key"/>) so that summaries of a run read
/// footers instead of every row: points per regime and per period, the range of the largest exponent,
/// points with several attractors and (continuation sweeps) hysteretic points. Deterministic: keys sorted,
/// numbers in round-trip form.
/// </summary>
internal sealed record PartTally(
    SortedDictionary<string, long> Regimes,
    SortedDictionary<int, long> Periods,
    double LargestExponentMin,
    double LargestExponentMax,
    long Multistable,
    long? Hysteresis,
    long Rows)
{
    public const string Key = "sweeps.tally";

    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public static PartTally Of(ChunkColumns columns)
    {
        // Counted in hash maps (one lookup per row; a sorted map per row cost a part as much as its numeric columns), sorted once.
        var regimeCounts = new Dictionary<string, long>(StringComparer.Ordinal);
        var periodCounts = new Dictionary<int, long>();
        var (min, max) = (double.PositiveInfinity, double.NegativeInfinity);
        var multistable = 0L;
        string? previous = null;
        var unused = 0L;
        ref var regimeCount = ref unused;
        for (var row = 0; row < columns.Count; row++)
        {
            // Rows hold a handful of distinct (shared) regime strings: look the count up only when the string changes.
            var regime = columns.Regime[row];
            if (!ReferenceEquals(regime, previous))
            {
                regimeCount = ref CollectionsMarshal.GetValueRefOrAddDefault(regimeCounts, regime, out _);
                previous = regime;
            }

            regimeCount++;
            if (columns.Period[row] > 0)
            {
                CollectionsMarshal.GetValueRefOrAddDefault(periodCounts, columns.Period[row], out _)++;
            }

            var exponent = columns.Lyapunov.Length > 0 ? columns.Lyapunov[0][row] : double.NaN;
            if (!double.IsNaN(exponent))
            {
                (min, max) = (Math.Min(min, exponent), Math.Max(max, exponent));
            }

            multistable += columns.Attractors[row] > 1 ? 1 : 0;
        }

        long? hysteresis = columns.Backward is null ? null : columns.Hysteresis.Take(columns.Count).LongCount(h => h);
        var regimes = new SortedDictionary<string, long>(regimeCounts, StringComparer.Ordinal);
        var periods = new SortedDictionary<int, long>(periodCounts);
        return new PartTally(regimes, periods, min, max, multistable, hysteresis, columns.Count);
    }

    /// <summary>The counts of this part's rows and <paramref name="other"/>'s together.</summary>
    public PartTally Plus(PartTally other)
    {
        var regimes = new SortedDictionary<string, long>(Regimes, StringComparer.Ordinal);
        foreach (var (regime, count) in other.Regimes)
        {
            regimes[regime] = regimes.GetValueOrDefault(regime) + count;
        }

        var periods = new SortedDictionary<int, long>(Periods);
        foreach (var (period, count) in other.Periods)
        {
            periods[period] = periods.GetValueOrDefault(period) + count;
        }

        var hysteresis = Hysteresis is null && other.Hysteresis is null ? (long?)null : (Hysteresis ?? 0) + (other.Hysteresis ?? 0);
        return new PartTally(
            regimes,
            periods,
            Math.Min(LargestExponentMin, other.LargestExponentMin),
            Math.Max(LargestExponentMax, other.LargestExponentMax),
            Multistable + other.Multistable,
            hysteresis,
            Rows + other.Rows);
    }

    public string ToJson() => CompactJson.Text(new JsonObject
    {
        ["rows"] = Rows,
        ["regimes"] = new JsonObject(Regimes.Select(r => KeyValuePair.Create(r.Key, (JsonNode?)r.Value))),
        ["periods"] = new JsonObject(Periods.Select(p => KeyValuePair.Create(p.Key.ToString(CultureInfo.InvariantCulture), (JsonNode?)p.Value))),
        ["lyapunov_1_min"] = LargestExponentMin.ToString("R", CultureInfo.InvariantCulture),
        ["lyapunov_1_max"] = LargestExponentMax.ToString("R", CultureInfo.InvariantCulture),
        ["multistable"] = Multistable,
        ["hysteresis"] = Hysteresis,
    });

    public static PartTally? FromJson(string? text)
    {
        if (text is null || JsonNode.Parse(text) is not JsonObject json)
        {
            return null;
        }

        var regimes = new SortedDictionary<string, long>(StringComparer.Ordinal);
        foreach (var (name, count) in json["regimes"]!.AsObject())
        {
            regimes[name] = count!.GetValue<long>();
        }

        var periods = new SortedDictionary<int, long>();
        foreach (var (period, count) in json["periods"]!.AsObject())
        {
            periods[int.Parse(period, CultureInfo.InvariantCulture)] = count!.GetValue<long>();
        }

        return new PartTally(
            regimes,
            periods,
            double.Parse(json["lyapunov_1_min"]!.GetValue<string>(), CultureInfo.InvariantCulture),
            double.Parse(json["lyapunov_1_max"]!.GetValue<string>(), CultureInfo.InvariantCulture),
            json["multistable"]!.GetValue<long>(),
            json["hysteresis"]?.GetValue<long>(),
            json["rows"]!.GetValue<long>());
    }
}
