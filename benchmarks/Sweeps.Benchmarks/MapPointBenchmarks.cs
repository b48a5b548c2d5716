using BenchmarkDotNet.Attributes;
using Sweeps.Core.Analysis;
using Sweeps.Core.Models;

namespace Sweeps.Benchmarks;

/// <summary>
/// The analysis of one map point, end to end (transient, tangent dynamics, period test, classification),
/// so that regressions in the per-point cost show up. Run with tools/bench-micro.
/// </summary>
[MemoryDiagnoser]
public class MapPointBenchmarks
{
    private MapAnalyzer logistic = null!;
    private MapAnalyzer henon = null!;
    private readonly double[] logisticParameters = [3.7];
    private readonly double[] henonParameters = [1.4, 0.3];

    [GlobalSetup]
    public void Setup()
    {
        logistic = new MapAnalyzer(Build(["x"], ["r"], "r*x*(1 - x)"), new AnalysisSettings(1000, 1000, LyapunovMode.Largest, 64));
        henon = new MapAnalyzer(Build(["x", "y"], ["a", "b"], "1 - a*x^2 + y", "b*x"), new AnalysisSettings(1000, 1000, LyapunovMode.Spectrum, 64));
    }

    /// <summary>Logistic-type map, chaotic point, transient 1000 + measure 1000, largest exponent + period test.</summary>
    [Benchmark(Baseline = true)]
    public PointResult LogisticLargest() => logistic.Analyze([0.3], logisticParameters);

    /// <summary>Hénon-type map, chaotic point, transient 1000 + measure 1000, full spectrum + period test.</summary>
    [Benchmark]
    public PointResult HenonSpectrum() => henon.Analyze([0.1, 0.1], henonParameters);

    private static Model Build(string[] variables, string[] parameters, params string[] equations)
    {
        Model.TryBuild(new ModelSource(ModelKind.Map, variables, parameters, equations), out var model, out var errors);
        return model ?? throw new InvalidOperationException(string.Join("; ", errors));
    }
}
