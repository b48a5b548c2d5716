using Sweeps.Engine.Config;
using Sweeps.Engine.Execution;
using Sweeps.Engine.Planning;
using Sweeps.Engine.Probing;
using Sweeps.Engine.Runs;

namespace Sweeps.Engine.Tests.Planning;

/// <summary>
/// The disk estimate against the bytes a run really writes: the same grid computed chunk by chunk into a temporary
/// run directory, its part files (and attractor parts) summed from the file system. The tolerance is the one
/// documented in docs/performance.md for the bundled configs.
/// </summary>
public sealed class DiskEstimateTests
{
    private const double Tolerance = 0.2;

    public static TheoryData<string, string> Configs() => new()
    {
        {
            "one-variable map with samples", """
            [model]
            kind = "map"
            variables = ["x"]
            parameters = ["r"]
            [model.equations]
            x = "r*x*(1 - x)"
            [initial]
            x = 0.3
            [grid]
            r = { from = 2.8, to = 4.0, steps = 6000 }
            [analysis]
            transient = 300
            measure = 300
            lyapunov = "largest"
            max_period = 32
            samples = 8
            """
        },
        {
            "two-variable map, full spectrum", """
            [model]
            kind = "map"
            variables = ["x", "y"]
            parameters = ["a", "b"]
            [model.equations]
            x = "1 - a*x^2 + y"
            y = "b*x"
            [initial]
            x = 0.1
            y = 0.1
            [grid]
            a = { from = 0.6, to = 1.4, steps = 60 }
            b = { from = 0.1, to = 0.3, steps = 50 }
            [analysis]
            transient = 300
            measure = 300
            lyapunov = "spectrum"
            max_period = 16
            samples = 4
            """
        },
        {
            "several starts (attractor parts)", """
            [model]
            kind = "map"
            variables = ["x"]
            parameters = ["a"]
            [model.equations]
            x = "a*x - x^3"
            [initial]
            x = 0.3
            [grid]
            a = { from = 1.1, to = 2.2, steps = 400 }
            [analysis]
            transient = 300
            measure = 300
            max_period = 16
            [starts]
            x = { from = -1, to = 1, steps = 4 }
            """
        },
        {
            "continuation (backward branch)", """
            [model]
            kind = "flow"
            variables = ["x"]
            parameters = ["p"]
            [model.equations]
            x = "2*(p + x - x^3)"
            [initial]
            x = -1.5
            [grid]
            p = { from = -0.8, to = 0.8, steps = 300 }
            follow = "p"
            [analysis]
            transient = 10
            measure = 5
            [integrator]
            method = "rk4"
            step = 0.05
            """
        },
    };

    [Theory]
    [MemberData(nameof(Configs))]
    public async Task Estimate_IsWithinTolerance_OfTheBytesARunWrites(string name, string config)
    {
        var spec = SpecReader.Parse(config, "test.toml");
        var model = ModelFactory.Build(spec);
        var cost = CostEstimate.Measure(spec, model).SecondsPerPoint;
        var plan = ChunkPlan.Of(spec, cost, workers: 2);
        var estimate = DiskEstimate.Measure(spec, model, plan, cost);

        var folder = Path.Combine(Path.GetTempPath(), $"sweeps-disk-{Guid.NewGuid():N}");
        try
        {
            var (run, _) = RunDirectory.CreateOrResume(Path.Combine(folder, "run"), spec, config, [], plan.ChunkSize, TimeProvider.System);
            var context = new RunContext(run, model);
            foreach (var chunk in run.MissingChunks())
            {
                await ChunkRunner.RunAsync(context, chunk, null, CancellationToken.None);
            }

            var written = Directory.EnumerateFiles(run.FullPath, "*.parquet", SearchOption.AllDirectories).Sum(file => new FileInfo(file).Length);
            var error = (estimate.TotalBytes - written) / written;
            Assert.True(Math.Abs(error) <= Tolerance, $"{name}: estimated {estimate.TotalBytes:F0} bytes, written {written} ({error:P1}, {plan.ChunkCount} parts, sample {estimate.SampledPoints})");
            Assert.True(estimate.SampledPoints >= Math.Min(32, spec.Grid.PointCount), $"{name}: {estimate.SampledPoints} points sampled");
        }
        finally
        {
            Directory.Delete(folder, recursive: true);
        }
    }
}
