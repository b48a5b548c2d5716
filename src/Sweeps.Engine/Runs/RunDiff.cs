using Parquet;
using Parquet.Schema;
using Sweeps.Engine.Config;

namespace Sweeps.Engine.Runs;

/// <summary>
/// What changed between two runs on the same grid, point by point: regime transitions, periods
/// that changed, shifts of the largest exponent. Runs on different grids are refused; otherwise the
/// report says whether the model, the settings or nothing at all differs between the specs. The two runs are read
/// part by part, side by side in point order, so memory holds a part of each and the changed points, not the runs.
/// </summary>
public sealed record RunDiff(
    string SpecChange,
    long Compared,
    long OnlyInOne,
    IReadOnlyDictionary<(string Before, string After), long> Transitions,
    long RegimeChanged,
    long PeriodChanged,
    long ExponentShifted,
    double LargestExponentShift,
    RunDiff.ChangedPoints Changed)
{
    /// <summary>Exponent differences at or below this are rounding, not change.</summary>
    public const double ExponentTolerance = 1e-9;

    /// <summary>No change of a point's class.</summary>
    public const byte Unchanged = 0;

    /// <summary>The regime stayed, the period changed.</summary>
    public const byte PeriodOnly = 1;

    /// <summary>The regime changed.</summary>
    public const byte Regime = 2;

    public bool NoChange => RegimeChanged == 0 && PeriodChanged == 0 && ExponentShifted == 0 && OnlyInOne == 0;

    /// <summary>
    /// Compares the runs. <paramref name="eachPart"/>, when given, sees every part of <paramref name="b"/> with a change code
    /// per row (<see cref="Unchanged"/> also for points only <paramref name="b"/> holds; <see cref="PeriodOnly"/>,
    /// <see cref="Regime"/>) — for a picture of the changes drawn as the runs are read.
    /// </summary>
    public static async Task<RunDiff> CompareAsync(RunDirectory a, RunDirectory b, Action<RunTable, byte[]>? eachPart = null, CancellationToken token = default)
    {
        var gridA = a.Manifest.Spec["grid"]!.ToJsonString();
        var gridB = b.Manifest.Spec["grid"]!.ToJsonString();
        if (gridA != gridB)
        {
            throw ConfigException.Single(b.FullPath, $"is on a different grid from {a.FullPath} ({string.Join(" × ", a.Manifest.Shape)} vs {string.Join(" × ", b.Manifest.Shape)}, or other axis values); diff compares runs of one grid");
        }

        var specChange = a.Manifest.SpecHash == b.Manifest.SpecHash
            ? "same spec"
            : a.Manifest.ModelHash != b.Manifest.ModelHash ? "the model changed" : "settings changed (same model)";

        // Both runs' parts hold ascending point ranges: the same points are found by walking them side by side. The
        // parts of a continuation sweep hold whole lines in line order, whose points interleave: those are walked in
        // line order (line, then step along it), which rises from part to part as the point index does elsewhere.
        var grid = a.LoadSpec().Grid;
        var lines = grid.Follow is not null;
        await using var earlier = RunTable.ReadEachPartAsync(a, samples: false, token: token).GetAsyncEnumerator(token);
        var (before, i, beforeRows) = ((RunTable?)null, 0, 0L);
        var (beforeKeys, beforeOrder) = (Array.Empty<long>(), (int[]?)null);
        async Task<bool> NextBefore()
        {
            while (await earlier.MoveNextAsync())
            {
                (before, i) = (earlier.Current, 0);
                (beforeKeys, beforeOrder) = Walk(grid, before, lines);
                beforeRows += before.Count;
                if (before.Count > 0)
                {
                    return true;
                }
            }

            before = null;
            return false;
        }

        var more = await NextBefore();
        var transitions = new Dictionary<(string, string), long>();
        var changed = new ChangedPoints(grid.Axes.Count);
        var (regimeChanged, periodChanged, shifted, compared, largest, afterRows) = (0L, 0L, 0L, 0L, 0.0, 0L);
        await foreach (var after in RunTable.ReadEachPartAsync(b, samples: false, token: token))
        {
            afterRows += after.Count;
            var codes = new byte[after.Count];
            var (afterKeys, afterOrder) = Walk(grid, after, lines);
            for (var k = 0; k < after.Count; k++)
            {
                while (more && beforeKeys[i] < afterKeys[k])
                {
                    more = ++i < before!.Count || await NextBefore();
                }

                if (!more || beforeKeys[i] != afterKeys[k])
                {
                    continue;
                }

                var (r, j) = (beforeOrder?[i] ?? i, afterOrder?[k] ?? k);
                compared++;
                var regimeDiffers = before!.Regime[r] != after.Regime[j];
                var periodDiffers = !regimeDiffers && before.Period[r] != after.Period[j];
                if (regimeDiffers)
                {
                    regimeChanged++;
                    var key = (before.Regime[r], after.Regime[j]);
                    transitions[key] = transitions.GetValueOrDefault(key) + 1;
                }

                periodChanged += periodDiffers ? 1 : 0;
                if (regimeDiffers || periodDiffers)
                {
                    changed.Add(before, r, after, j);
                    codes[j] = regimeDiffers ? Regime : PeriodOnly;
                }

                var (x, y) = (before.Lyapunov[r], after.Lyapunov[j]);
                var shift = double.IsFinite(x) && double.IsFinite(y) ? Math.Abs(x - y) : (x.Equals(y) ? 0 : double.PositiveInfinity);
                if (shift > ExponentTolerance)
                {
                    shifted++;
                    largest = Math.Max(largest, double.IsFinite(shift) ? shift : largest);
                }
            }

            eachPart?.Invoke(after, codes);
        }

        // The parts of the first run beyond the second's last point still count as present in one run only.
        while (await NextBefore())
        {
        }

        var onlyInOne = (beforeRows - compared) + (afterRows - compared);
        if (lines)
        {
            changed.SortByPoint();
        }

        return new RunDiff(specChange, compared, onlyInOne, transitions, regimeChanged, periodChanged, shifted, largest, changed);
    }

    /// <summary>
    /// The order a part is walked in: its rows by point index, or along lines (<see cref="Specs.Grid.LineOrder"/>) for a
    /// continuation sweep — each row's key and, where that is not the rows' own order, the rows in key order.
    /// </summary>
    private static (long[] Keys, int[]? Order) Walk(Specs.Grid grid, RunTable table, bool lines)
    {
        if (!lines)
        {
            return (table.Point, null);
        }

        var keys = table.Point.Select(grid.LineOrder).ToArray();
        var order = Enumerable.Range(0, table.Count).ToArray();
        Array.Sort(keys, order);
        return (keys, order);
    }

    /// <summary>The changed points (regime or period) as Parquet: point, axes, and both sides' regime, period and λ1.</summary>
    public async Task WriteChangedAsync(string path, IReadOnlyList<string> axisNames, CancellationToken token)
    {
        var point = new DataField<long>("point");
        var axes = axisNames.Select(n => new DataField<double>(n)).ToArray();
        var regimeBefore = new DataField<string>("regime_before");
        var regimeAfter = new DataField<string>("regime_after");
        var periodBefore = new DataField<int>("period_before");
        var periodAfter = new DataField<int>("period_after");
        var lyapunovBefore = new DataField<double>("lyapunov_1_before");
        var lyapunovAfter = new DataField<double>("lyapunov_1_after");
        var schema = new ParquetSchema(new Field[] { point }.Concat(axes).Concat([regimeBefore, regimeAfter, periodBefore, periodAfter, lyapunovBefore, lyapunovAfter]));
        await using var stream = File.Create(path);
        await using var writer = await ParquetWriter.CreateAsync(schema, stream, PartWriter.Options(), false, token);
        using var group = writer.CreateRowGroup();
        await group.WriteAsync(point, (ReadOnlyMemory<long>)Changed.Point.ToArray(), null, null, token);
        for (var a = 0; a < axes.Length; a++)
        {
            await group.WriteAsync(axes[a], (ReadOnlyMemory<double>)Changed.Axes[a].ToArray(), null, null, token);
        }

        await group.WriteAsync(regimeBefore, Changed.RegimeBefore.ToArray());
        await group.WriteAsync(regimeAfter, Changed.RegimeAfter.ToArray());
        await group.WriteAsync(periodBefore, (ReadOnlyMemory<int>)Changed.PeriodBefore.ToArray(), null, null, token);
        await group.WriteAsync(periodAfter, (ReadOnlyMemory<int>)Changed.PeriodAfter.ToArray(), null, null, token);
        await group.WriteAsync(lyapunovBefore, (ReadOnlyMemory<double>)Changed.LyapunovBefore.ToArray(), null, null, token);
        await group.WriteAsync(lyapunovAfter, (ReadOnlyMemory<double>)Changed.LyapunovAfter.ToArray(), null, null, token);
    }

    /// <summary>The points whose regime or period changed, in point order: where they are and both sides' values.</summary>
    public sealed class ChangedPoints(int axes)
    {
        public List<long> Point { get; } = [];

        /// <summary>Per axis, the points' values (the second run's).</summary>
        public List<double>[] Axes { get; } = Enumerable.Range(0, axes).Select(_ => new List<double>()).ToArray();

        public List<string> RegimeBefore { get; } = [];

        public List<string> RegimeAfter { get; } = [];

        public List<int> PeriodBefore { get; } = [];

        public List<int> PeriodAfter { get; } = [];

        public List<double> LyapunovBefore { get; } = [];

        public List<double> LyapunovAfter { get; } = [];

        public int Count => Point.Count;

        /// <summary>Puts the points in point order (they were found along lines).</summary>
        internal void SortByPoint()
        {
            var order = Enumerable.Range(0, Count).OrderBy(k => Point[k]).ToArray();
            static void Reorder<T>(List<T> list, int[] order)
            {
                var sorted = order.Select(k => list[k]).ToList();
                list.Clear();
                list.AddRange(sorted);
            }

            Reorder(Point, order);
            foreach (var axis in Axes)
            {
                Reorder(axis, order);
            }

            Reorder(RegimeBefore, order);
            Reorder(RegimeAfter, order);
            Reorder(PeriodBefore, order);
            Reorder(PeriodAfter, order);
            Reorder(LyapunovBefore, order);
            Reorder(LyapunovAfter, order);
        }

        internal void Add(RunTable before, int i, RunTable after, int j)
        {
            Point.Add(after.Point[j]);
            for (var a = 0; a < Axes.Length; a++)
            {
                Axes[a].Add(after.Axes[a][j]);
            }

            RegimeBefore.Add(before.Regime[i]);
            RegimeAfter.Add(after.Regime[j]);
            PeriodBefore.Add(before.Period[i]);
            PeriodAfter.Add(after.Period[j]);
            LyapunovBefore.Add(before.Lyapunov[i]);
            LyapunovAfter.Add(after.Lyapunov[j]);
        }
    }
}
