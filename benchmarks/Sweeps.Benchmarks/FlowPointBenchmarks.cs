using BenchmarkDotNet.Attributes;
using Sweeps.Core.Analysis;
using Sweeps.Core.Integrators;
using Sweeps.Core.Models;

namespace Sweeps.Benchmarks;

/// <summary>One flow point, end to end: Lorenz-type, RK4 at dt = 0.01, transient 20 + measure 200, full spectrum.</summary>
[MemoryDiagnoser]
public class FlowPointBenchmarks
{
    private FlowAnalyzer lorenz = null!;
    private readonly double[] parameters = [10, 28, 8.0 / 3];

    [GlobalSetup]
    public void Setup()
    {
        var source = new ModelSource(ModelKind.Flow, ["x", "y", "z"], ["sigma", "rho", "beta"], ["sigma*(y - x)", "x*(rho - z) - y", "x*y - beta*z"]);
        Model.TryBuild(source, out var model, out var errors);
        lorenz = new FlowAnalyzer(
            model ?? throw new InvalidOperationException(string.Join("; ", errors)),
            new AnalysisSettings(Transient: 20, Measure: 200, Tolerance: 1e-6, ZeroBand: 5e-3),
            new IntegratorSettings(IntegratorMethod.Rk4, 0.01),
            new SectionSettings());
    }

    [Benchmark]
    public PointResult LorenzRk4Spectrum() => lorenz.Analyze([1, 1, 1], parameters);
}
