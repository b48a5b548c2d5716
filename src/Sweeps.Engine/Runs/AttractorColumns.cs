using Sweeps.Core.Analysis;
using Sweeps.Core.Attractors;

namespace Sweeps.Engine.Runs;

/// <summary>The attractors of one chunk's points, column by column; grows as attractors are added.</summary>
internal sealed class AttractorColumns(int dimension)
{
    public List<long> Point { get; } = [];

    public List<int> Id { get; } = [];

    public List<string> Regime { get; } = [];

    public List<int> Period { get; } = [];

    public List<double> PeriodTime { get; } = [];

    public List<double> BasinFraction { get; } = [];

    public List<int> StartCount { get; } = [];

    public List<int> FirstStart { get; } = [];

    public List<double>[] Lyapunov { get; } = Lists(dimension);

    public List<double>[] LyapunovError { get; } = Lists(dimension);

    public List<double>[] State { get; } = Lists(dimension);

    public List<double>[] Low { get; } = Lists(dimension);

    public List<double>[] High { get; } = Lists(dimension);

    public List<string?> Reason { get; } = [];

    public int Count => Point.Count;

    public void Add(long point, FoundAttractor attractor)
    {
        var result = attractor.Result;
        var signature = attractor.Signature;
        Point.Add(point);
        Id.Add(attractor.Id);
        Regime.Add(result.Regime.ToText());
        Period.Add(result.Period);
        PeriodTime.Add(result.PeriodTime);
        BasinFraction.Add(attractor.BasinFraction);
        StartCount.Add(attractor.Starts);
        FirstStart.Add(attractor.FirstStart);
        for (var i = 0; i < dimension; i++)
        {
            Lyapunov[i].Add(i < result.Lyapunov.Length ? result.Lyapunov[i] : double.NaN);
            LyapunovError[i].Add(i < result.LyapunovError.Length ? result.LyapunovError[i] : double.NaN);
            State[i].Add(signature.State[i]);
            Low[i].Add(signature.Box.Low[i]);
            High[i].Add(signature.Box.High[i]);
        }

        Reason.Add(result.Reason);
    }

    private static List<double>[] Lists(int count) => Enumerable.Range(0, count).Select(_ => new List<double>()).ToArray();
}
