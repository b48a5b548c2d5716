using System.Runtime.CompilerServices;
using Sweeps.Core.Analysis;
using Sweeps.Engine.Runs;

namespace Sweeps.Engine.Execution;

/// <summary>
/// Computes one chunk — a contiguous range of point indices — and writes its part file. A point's
/// result depends only on the spec and its index, never on the chunk, the worker or the order, which
/// is what makes runs resumable and bit-for-bit reproducible. A point whose analysis throws is
/// recorded as unresolved with the reason; it never fails the chunk.
/// </summary>
public static class ChunkRunner
{
    private const int ProgressEvery = 256;

    /// <summary>Runs the chunk unless its part already exists; returns the number of points computed.</summary>
    public static async Task<long> RunAsync(RunContext context, long chunk, Action<long>? progress, CancellationToken token)
    {
        var run = context.Run;
        var path = run.PartPath(chunk);
        if (File.Exists(path))
        {
            return 0;
        }

        var columns = Compute(context, chunk, progress, token);
        await PartWriter.WriteAsync(path, context.Schema, columns, context.Metadata, token);
        return columns.Count;
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static ChunkColumns Compute(RunContext context, long chunk, Action<long>? progress, CancellationToken token)
    {
        var spec = context.Spec;
        var manifest = context.Run.Manifest;
        var first = chunk * manifest.ChunkSize;
        var last = Math.Min(manifest.Points, first + manifest.ChunkSize);
        var analyzer = Probing.AnalyzerFactory.Create(spec, context.Model);
        var columns = new ChunkColumns((int)(last - first), spec.Grid.Axes.Count, spec.Model.Variables.Count, spec.Analysis.Indicators);
        var source = new Specs.PointSource(spec);
        var pending = 0L;
        for (var point = first; point < last; point++)
        {
            source.Fill(point);
            columns.Add(point, source.AxisValues, Analyze(analyzer, source.Initial, source.Parameters));
            if (++pending == ProgressEvery)
            {
                token.ThrowIfCancellationRequested();
                progress?.Invoke(pending);
                pending = 0;
            }
        }

        progress?.Invoke(pending);
        return columns;
    }

    private static PointResult Analyze(IPointAnalyzer analyzer, double[] initial, double[] parameters)
    {
        try
        {
            return analyzer.Analyze(initial, parameters);
        }
        catch (Exception error) when (error is ArithmeticException or ArgumentException or InvalidOperationException or IndexOutOfRangeException)
        {
            var nan = Enumerable.Repeat(double.NaN, initial.Length).ToArray();
            return PointResult.Stopped(Regime.Unresolved, 0, nan, null, $"analysis failed: {error.Message}");
        }
    }
}
