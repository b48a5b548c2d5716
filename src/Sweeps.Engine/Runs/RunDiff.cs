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
        // parts of a continuation sweep hold whole lines, whose points interleave: those runs are read whole.
        var grid = a.LoadSpec().Grid;
        var lines = grid.Follow is not null;
        await using var earlier = InOrder(a, lines, token).GetAsyncEnumerator(token);
        var (before, i, beforeRows) = ((RunTable?)null, 0, 0L);
        async Task<bool> NextBefore()
        {
            while (await earlier.MoveNextAsync())
            {
                (before, i) = (earlier.Current, 0);
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
        await foreach (var after in InOrder(b, lines, token))
        {
            afterRows += after.Count;
            var codes = new byte[after.Count];
            for (var j = 0; j < after.Count; j++)
            {
                while (more && before!.Point[i] < after.Point[j])
                {
                    more = ++i < before.Count || await NextBefore();
                }

                if (!more || before!.Point[i] != after.Point[j])
                {
                    continue;
                }

                compared++;
                var regimeDiffers = before.Regime[i] != after.Regime[j];
                var periodDiffers = !regimeDiffers && before.Period[i] != after.Period[j];
                if (regimeDiffers)
                {
                    regimeChanged++;
                    var key = (before.Regime[i], after.Regime[j]);
                    transitions[key] = transitions.GetValueOrDefault(key) + 1;
                }

                periodChanged += periodDiffers ? 1 : 0;
                if (regimeDiffers || periodDiffers)
                {
                    changed.Add(before, i, after, j);
                    codes[j] = regimeDiffers ? Regime : PeriodOnly;
                }

                var (x, y) = (before.Lyapunov[i], after.Lyapunov[j]);
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
        return new RunDiff(specChange, compared, onlyInOne, transitions, regimeChanged, periodChanged, shifted, largest, changed);
    }

    /// <summary>The run's rows in point order: part by part, or (<paramref name="whole"/>) all at once as one table.</summary>
    private static async IAsyncEnumerable<RunTable> InOrder(RunDirectory run, bool whole, [System.Runtime.CompilerServices.EnumeratorCancellation] CancellationToken token)
    {
        if (whole)
        {
            yield return await RunTable.ReadAsync(run, samples: false, token);
            yield break;
        }

        await foreach (var part in RunTable.ReadEachPartAsync(run, samples: false, token: token))
        {
            yield return part;
        }
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
