using Parquet.Schema;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Runs;

/// <summary>
/// The columns of an attractor part file, one row per distinct outcome of a point's starts: <c>point</c>,
/// <c>attractor</c> (0 = largest basin), <c>regime</c>, <c>period</c>, <c>period_time</c>,
/// <c>basin_fraction</c> (starts reaching it over all starts; a point's fractions sum to 1),
/// <c>start_count</c>, <c>first_start</c> (index of the first start reaching it), <c>lyapunov_1…n</c>,
/// <c>lyapunov_error_1…n</c>, <c>state_&lt;variable&gt;</c> (a representative state: for a cycle its
/// lexicographically first point, otherwise the final state), <c>low_&lt;variable&gt;</c> and
/// <c>high_&lt;variable&gt;</c> (the box its recorded states fill) and <c>reason</c>. Part of the output contract.
/// </summary>
public sealed class AttractorSchema
{
    public AttractorSchema(SweepSpec spec)
    {
        var n = spec.Model.Variables.Count;
        Point = new DataField<long>("point");
        Id = new DataField<int>("attractor");
        Regime = new DataField<string>("regime");
        Period = new DataField<int>("period");
        PeriodTime = new DataField<double>("period_time");
        BasinFraction = new DataField<double>("basin_fraction");
        StartCount = new DataField<int>("start_count");
        FirstStart = new DataField<int>("first_start");
        Lyapunov = Enumerable.Range(1, n).Select(i => new DataField<double>($"lyapunov_{i}")).ToArray();
        LyapunovError = Enumerable.Range(1, n).Select(i => new DataField<double>($"lyapunov_error_{i}")).ToArray();
        State = spec.Model.Variables.Select(v => new DataField<double>($"state_{v}")).ToArray();
        Low = spec.Model.Variables.Select(v => new DataField<double>($"low_{v}")).ToArray();
        High = spec.Model.Variables.Select(v => new DataField<double>($"high_{v}")).ToArray();
        Reason = new DataField<string>("reason", true);
        Schema = new ParquetSchema(
            new Field[] { Point, Id, Regime, Period, PeriodTime, BasinFraction, StartCount, FirstStart }
                .Concat(Lyapunov)
                .Concat(LyapunovError)
                .Concat(State)
                .Concat(Low)
                .Concat(High)
                .Append(Reason));
    }

    public ParquetSchema Schema { get; }

    public DataField<long> Point { get; }

    public DataField<int> Id { get; }

    public DataField<string> Regime { get; }

    public DataField<int> Period { get; }

    public DataField<double> PeriodTime { get; }

    public DataField<double> BasinFraction { get; }

    public DataField<int> StartCount { get; }

    public DataField<int> FirstStart { get; }

    public IReadOnlyList<DataField<double>> Lyapunov { get; }

    public IReadOnlyList<DataField<double>> LyapunovError { get; }

    public IReadOnlyList<DataField<double>> State { get; }

    public IReadOnlyList<DataField<double>> Low { get; }

    public IReadOnlyList<DataField<double>> High { get; }

    public DataField<string> Reason { get; }
}
