using Parquet.Schema;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Runs;

/// <summary>
/// The columns of a part file, in order: <c>point</c>, one column per grid axis, <c>regime</c>,
/// <c>period</c>, <c>period_time</c> (flows; NaN for maps), <c>attractors</c> (distinct outcomes of the point's starts, escape included; 1 with one start), <c>lyapunov_1…n</c>, <c>lyapunov_error_1…n</c>, <c>final_&lt;variable&gt;</c>,
/// (with indicators: <c>zero_one_k</c>, <c>permutation_entropy</c>, <c>lz_complexity</c>), <c>reason</c> and <c>samples</c> (the last states, row-major, as a list);
/// in a continuation sweep these describe the forward branch, and <c>hysteresis</c>, <c>backward_regime</c>, <c>backward_period</c>,
/// <c>backward_lyapunov_1</c>, <c>backward_final_&lt;variable&gt;</c> and <c>backward_samples</c> follow. Part of the output contract.
/// </summary>
public sealed class PartSchema
{
    public PartSchema(SweepSpec spec)
    {
        var n = spec.Model.Variables.Count;
        Point = new DataField<long>("point");
        Axes = spec.Grid.Axes.Select(a => new DataField<double>(a.Name)).ToArray();
        Regime = new DataField<string>("regime");
        Period = new DataField<int>("period");
        PeriodTime = new DataField<double>("period_time");
        Attractors = new DataField<int>("attractors");
        Lyapunov = Enumerable.Range(1, n).Select(i => new DataField<double>($"lyapunov_{i}")).ToArray();
        LyapunovError = Enumerable.Range(1, n).Select(i => new DataField<double>($"lyapunov_error_{i}")).ToArray();
        Final = spec.Model.Variables.Select(v => new DataField<double>($"final_{v}")).ToArray();
        Reason = new DataField<string>("reason", true);
        Indicators = spec.Analysis.Indicators
            ? [new DataField<double>("zero_one_k"), new DataField<double>("permutation_entropy"), new DataField<double>("lz_complexity")]
            : [];
        SampleValue = new DataField<double>("element");
        Samples = new ListField("samples", SampleValue);
        HasBranches = spec.Grid.Follow is not null;
        Hysteresis = new DataField<bool>("hysteresis");
        BackwardRegime = new DataField<string>("backward_regime");
        BackwardPeriod = new DataField<int>("backward_period");
        BackwardLyapunov = new DataField<double>("backward_lyapunov_1");
        BackwardFinal = spec.Model.Variables.Select(v => new DataField<double>($"backward_final_{v}")).ToArray();
        BackwardSampleValue = new DataField<double>("element");
        BackwardSamples = new ListField("backward_samples", BackwardSampleValue);
        Field[] branches = HasBranches
            ? [Hysteresis, BackwardRegime, BackwardPeriod, BackwardLyapunov, .. BackwardFinal, BackwardSamples]
            : [];
        Schema = new ParquetSchema(
            new Field[] { Point }
                .Concat(Axes)
                .Append(Regime)
                .Append(Period)
                .Append(PeriodTime)
                .Append(Attractors)
                .Concat(Lyapunov)
                .Concat(LyapunovError)
                .Concat(Final)
                .Concat(Indicators)
                .Append(Reason)
                .Append(Samples)
                .Concat(branches));
    }

    /// <summary>Names a model may not use, because they would collide with a fixed column.</summary>
    public static bool Collides(string name) =>
        name is "point" or "regime" or "period" or "period_time" or "attractors" or "reason" or "samples" or "hysteresis"
        || name.StartsWith("backward_", StringComparison.Ordinal)
        || name.StartsWith("lyapunov_", StringComparison.Ordinal)
        || name.StartsWith("final_", StringComparison.Ordinal);

    public ParquetSchema Schema { get; }

    public DataField<long> Point { get; }

    public IReadOnlyList<DataField<double>> Axes { get; }

    public DataField<string> Regime { get; }

    public DataField<int> Period { get; }

    public DataField<double> PeriodTime { get; }

    public DataField<int> Attractors { get; }

    public IReadOnlyList<DataField<double>> Lyapunov { get; }

    public IReadOnlyList<DataField<double>> LyapunovError { get; }

    public IReadOnlyList<DataField<double>> Final { get; }

    /// <summary>zero_one_k, permutation_entropy, lz_complexity — present only when the spec asks for indicators.</summary>
    public IReadOnlyList<DataField<double>> Indicators { get; }

    public DataField<string> Reason { get; }

    public DataField<double> SampleValue { get; }

    public ListField Samples { get; }

    /// <summary>Whether the spec is a continuation sweep, whose parts carry the backward branch.</summary>
    public bool HasBranches { get; }

    public DataField<bool> Hysteresis { get; }

    public DataField<string> BackwardRegime { get; }

    public DataField<int> BackwardPeriod { get; }

    public DataField<double> BackwardLyapunov { get; }

    public IReadOnlyList<DataField<double>> BackwardFinal { get; }

    public DataField<double> BackwardSampleValue { get; }

    public ListField BackwardSamples { get; }
}
