using Parquet;
using Parquet.Schema;
using Sweeps.Engine.Config;

namespace Sweeps.Engine.Runs;

/// <summary>
/// What changed between two runs on the same grid, point by point: regime transitions, periods
/// that changed, shifts of the largest exponent. Runs on different grids are refused; otherwise the
/// report says whether the model, the settings or nothing at all differs between the specs.
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
    IReadOnlyList<int> ChangedRows,
    RunTable Before,
    RunTable After)
{
    /// <summary>For each of <see cref="ChangedRows"/> (rows of <see cref="After"/>), the same point's row in <see cref="Before"/>.</summary>
    public IReadOnlyList<int> ChangedBeforeRows { get; private init; } = [];

    /// <summary>Per row of <see cref="After"/>: 0 unchanged or only in one run, 1 the period changed, 2 the regime changed.</summary>
    public byte[] Change { get; private init; } = [];

    /// <summary>Exponent differences at or below this are rounding, not change.</summary>
    public const double ExponentTolerance = 1e-9;

    public bool NoChange => RegimeChanged == 0 && PeriodChanged == 0 && ExponentShifted == 0 && OnlyInOne == 0;

    public static async Task<RunDiff> CompareAsync(RunDirectory a, RunDirectory b, CancellationToken token)
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
        var before = await RunTable.ReadAsync(a, samples: false, token);
        var after = await RunTable.ReadAsync(b, samples: false, token);

        // Both tables are in point order: the same points are found by walking them side by side (no index of either).
        var transitions = new Dictionary<(string, string), long>();
        var changed = new List<int>();
        var changedBefore = new List<int>();
        var change = new byte[after.Count];
        var (regimeChanged, periodChanged, shifted, compared, largest) = (0L, 0L, 0L, 0L, 0.0);
        var i = 0;
        for (var j = 0; j < after.Count; j++)
        {
            while (i < before.Count && before.Point[i] < after.Point[j])
            {
                i++;
            }

            if (i == before.Count || before.Point[i] != after.Point[j])
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
                changed.Add(j);
                changedBefore.Add(i);
                change[j] = regimeDiffers ? (byte)2 : (byte)1;
            }

            var (x, y) = (before.Lyapunov[i], after.Lyapunov[j]);
            var shift = double.IsFinite(x) && double.IsFinite(y) ? Math.Abs(x - y) : (x.Equals(y) ? 0 : double.PositiveInfinity);
            if (shift > ExponentTolerance)
            {
                shifted++;
                largest = Math.Max(largest, double.IsFinite(shift) ? shift : largest);
            }
        }

        var onlyInOne = (before.Count - compared) + (after.Count - compared);
        return new RunDiff(specChange, compared, onlyInOne, transitions, regimeChanged, periodChanged, shifted, largest, changed, before, after)
        {
            ChangedBeforeRows = changedBefore,
            Change = change,
        };
    }

    /// <summary>The changed points (regime or period) as Parquet: point, axes, and both sides' regime, period and λ1.</summary>
    public async Task WriteChangedAsync(string path, IReadOnlyList<string> axisNames, CancellationToken token)
    {
        var rows = ChangedRows;
        var point = new DataField<long>("point");
        var axes = axisNames.Select(n => new DataField<double>(n)).ToArray();
        var regimeBefore = new DataField<string>("regime_before");
        var regimeAfter = new DataField<string>("regime_after");
        var periodBefore = new DataField<int>("period_before");
        var periodAfter = new DataField<int>("period_after");
        var lyapunovBefore = new DataField<double>("lyapunov_1_before");
        var lyapunovAfter = new DataField<double>("lyapunov_1_after");
        var schema = new ParquetSchema(new Field[] { point }.Concat(axes).Concat([regimeBefore, regimeAfter, periodBefore, periodAfter, lyapunovBefore, lyapunovAfter]));
        var old = ChangedBeforeRows;
        await using var stream = File.Create(path);
        await using var writer = await ParquetWriter.CreateAsync(schema, stream, PartWriter.Options(), false, token);
        using var group = writer.CreateRowGroup();
        await group.WriteAsync(point, (ReadOnlyMemory<long>)rows.Select(r => After.Point[r]).ToArray(), null, null, token);
        for (var a = 0; a < axes.Length; a++)
        {
            await group.WriteAsync(axes[a], (ReadOnlyMemory<double>)rows.Select(r => After.Axes[a][r]).ToArray(), null, null, token);
        }

        await group.WriteAsync(regimeBefore, old.Select(r => Before.Regime[r]).ToArray());
        await group.WriteAsync(regimeAfter, rows.Select(r => After.Regime[r]).ToArray());
        await group.WriteAsync(periodBefore, (ReadOnlyMemory<int>)old.Select(r => Before.Period[r]).ToArray(), null, null, token);
        await group.WriteAsync(periodAfter, (ReadOnlyMemory<int>)rows.Select(r => After.Period[r]).ToArray(), null, null, token);
        await group.WriteAsync(lyapunovBefore, (ReadOnlyMemory<double>)old.Select(r => Before.Lyapunov[r]).ToArray(), null, null, token);
        await group.WriteAsync(lyapunovAfter, (ReadOnlyMemory<double>)rows.Select(r => After.Lyapunov[r]).ToArray(), null, null, token);
    }
}
