using System.Runtime.CompilerServices;
using Sweeps.Core.Analysis;
using Sweeps.Core.Attractors;
using Sweeps.Core.Kernels;
using Sweeps.Engine.Runs;

namespace Sweeps.Engine.Execution;

/// <summary>
/// Computes one chunk — a contiguous range of point indices — and writes its part files. A point's
/// result depends only on the spec and its index, never on the chunk, the worker or the order, which
/// is what makes runs resumable and bit-for-bit reproducible. A point whose analysis throws is
/// recorded as unresolved with the reason; it never fails the chunk. With several starts per point,
/// every start is analysed, the outcomes are grouped into distinct attractors, and the point's row
/// describes the one with the largest basin.
/// </summary>
public static class ChunkRunner
{
    private const int ProgressEvery = 256;

    /// <summary>
    /// Runs the chunk unless its part already exists; returns the number of points computed. The part is written as the
    /// points are computed, a row group at a time (<see cref="PartStream"/>).
    /// </summary>
    public static async Task<long> RunAsync(RunContext context, long chunk, Action<long>? progress, CancellationToken token)
    {
        var run = context.Run;
        var path = run.PartPath(chunk);
        if (File.Exists(path))
        {
            return 0;
        }

        var manifest = run.Manifest;
        var first = chunk * manifest.ChunkSize;
        var count = (int)(Math.Min(manifest.Points, first + manifest.ChunkSize) - first);
        var columns = context.RentColumns(count);
        try
        {
            using var part = new PartStream(path, context.Schema, context.GroupRows);
            var (rest, attractors) = context.Spec.Grid.Follow is null
                ? ComputePoints(context.Model, context.WritesAttractors, context.Spec, columns, count, i => first + i, part, progress, token)
                : ComputeLines(context, chunk, columns, part, progress, token);
            part.Append(rest);

            // The attractor part first: a chunk whose main part exists is complete in both tables. With one start per
            // point it would repeat the main table, so it is written only when a point can have several outcomes.
            if (context.WritesAttractors)
            {
                await PartWriter.WriteAsync(run.AttractorPartPath(chunk), context.AttractorSchema, attractors, context.Metadata, token);
            }

            context.Wrote(chunk, part.Commit(context.Metadata));
            return count;
        }
        finally
        {
            context.ReturnColumns(columns);
        }
    }

    /// <summary>
    /// Computes the listed points of <paramref name="spec"/> (whose grid may be a refinement lattice of the
    /// run's) and writes them as a part under <paramref name="folder"/>, with its attractor part beside it.
    /// </summary>
    public static async Task RunPointsAsync(RunContext context, Specs.SweepSpec spec, long[] points, string folder, long part, CancellationToken token)
    {
        var path = Path.Combine(folder, "parts", $"part-{part:D6}.parquet");
        if (File.Exists(path))
        {
            return;
        }

        // Written as computed, a row group at a time, as a chunk's part is.
        var groupRows = ChunkColumns.GroupRows(spec);
        using var stream = new PartStream(path, context.Schema, groupRows);
        var columns = ChunkColumns.For(spec, Math.Min(points.Length, groupRows));
        var (rest, attractors) = ComputePoints(context.Model, context.WritesAttractors, spec, columns, points.Length, i => points[i], stream, null, token);
        stream.Append(rest);
        if (context.WritesAttractors)
        {
            await PartWriter.WriteAsync(Path.Combine(folder, "attractors", Path.GetFileName(path)), context.AttractorSchema, attractors, context.Metadata, token);
        }

        stream.Commit(context.Metadata);
    }

    /// <summary>
    /// The rows a run of <paramref name="spec"/> writes for the listed points, for size estimates. In a continuation
    /// sweep each point is analysed alone and its backward branch is a copy of the forward one: the same columns and
    /// sizes as a real line, not its values.
    /// </summary>
    internal static (ChunkColumns Points, AttractorColumns Attractors) ComputeSample(Specs.SweepSpec spec, Core.Models.Model model, IReadOnlyList<long> points)
    {
        var follow = spec.Grid.Follow is not null;
        var columns = ChunkColumns.For(spec, points.Count, branches: follow);
        if (!follow)
        {
            return ComputePoints(model, spec.GroupsAttractors, spec, columns, points.Count, i => points[i], null, null, CancellationToken.None);
        }

        var analyzer = Probing.AnalyzerFactory.Create(spec, model);
        var attractors = new AttractorColumns(spec.Model.Variables.Count);
        var source = new Specs.PointSource(spec);
        foreach (var point in points)
        {
            source.Fill(point);
            var result = Analyze(analyzer, source.Initial, source.Parameters);
            columns.Add(point, source.AxisValues, result);
            columns.AddBackward(result, hysteresis: false);
            attractors.Add(point, AttractorGrouping.Single(result, spec.Analysis)[0]);
        }

        return (columns, attractors);
    }

    /// <summary>
    /// Computes <paramref name="count"/> points into <paramref name="columns"/>; with a <paramref name="part"/>, every
    /// <see cref="PartStream.GroupRows"/> rows go to it as a row group (which empties the columns), and the rows after the
    /// last full group are left in the columns returned.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static (ChunkColumns Points, AttractorColumns Attractors) ComputePoints(
        Core.Models.Model model, bool writesAttractors, Specs.SweepSpec spec, ChunkColumns columns, int count, Func<int, long> pointAt, PartStream? part, Action<long>? progress, CancellationToken token)
    {
        // Parts store no cycle states or boxes: only attractor rows need them.
        if (Probing.AnalyzerFactory.CreateBlock(spec, model, lean: !writesAttractors) is { } block)
        {
            return ComputeBlocks(block, spec, columns, count, pointAt, part, progress, token);
        }

        var analyzer = Probing.AnalyzerFactory.Create(spec, model, lean: !writesAttractors);
        var dimension = spec.Model.Variables.Count;
        var attractors = new AttractorColumns(dimension);
        var source = new Specs.PointSource(spec);
        var starts = spec.Starts is { } startSpec ? new Specs.StartSource(startSpec, dimension) : null;
        var outcomes = new PointResult[spec.StartCount];
        var pending = 0L;
        for (var i = 0; i < count; i++)
        {
            if (part is not null && columns.Count == part.GroupRows)
            {
                part.Append(columns);
            }

            var point = pointAt(i);
            source.Fill(point);
            if (starts is null)
            {
                // One start, one outcome: its attractor row (and signature) only where attractor parts are written.
                var result = Analyze(analyzer, source.Initial, source.Parameters);
                columns.Add(point, source.AxisValues, result);
                if (writesAttractors)
                {
                    attractors.Add(point, AttractorGrouping.Single(result, spec.Analysis)[0]);
                }
            }
            else
            {
                starts.Fill(point, source.Initial);
                for (var k = 0; k < outcomes.Length; k++)
                {
                    outcomes[k] = Analyze(analyzer, starts.States[k], source.Parameters);
                }

                var found = AttractorGrouping.Group(outcomes, spec.Analysis);
                columns.Add(point, source.AxisValues, found[0].Result, found.Count);
                foreach (var attractor in found)
                {
                    attractors.Add(point, attractor);
                }
            }

            if (++pending == ProgressEvery)
            {
                token.ThrowIfCancellationRequested();
                progress?.Invoke(pending);
                pending = 0;
            }
        }

        progress?.Invoke(pending);
        return (columns, attractors);
    }

    /// <summary>
    /// One-variable maps (32 points at a time), maps of several variables and fixed-step flows (4 at a time) through a generated block kernel,
    /// which gives the scalar analyzer's results bit for bit. A block whose analysis throws is redone point by point.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static (ChunkColumns Points, AttractorColumns Attractors) ComputeBlocks(
        IBlockAnalyzer block, Specs.SweepSpec spec, ChunkColumns columns, int count, Func<int, long> pointAt, PartStream? part, Action<long>? progress, CancellationToken token)
    {
        var dimension = spec.Model.Variables.Count;
        var attractors = new AttractorColumns(dimension);
        var size = block.BlockSize;
        var source = new Specs.BlockSource(spec, size);
        var (initial, parameters, axes, points) = (source.Initial, source.Parameters, source.AxisValues, source.Points);
        var rows = new BlockRows(columns, source);
        for (var i = 0; i < count; i += size)
        {
            var lanes = Math.Min(size, count - i);
            if (part is not null && columns.Count + size > part.GroupRows)
            {
                // A group's rows are a whole number of blocks (ChunkColumns.GroupRows): it ends where a block does.
                part.Append(columns);
            }

            source.Fill(lanes, pointAt, offset: i);
            var before = columns.Count;

            try
            {
                block.Analyze(initial, parameters, lanes, rows);
            }
            catch (Exception error) when (error is ArithmeticException or ArgumentException or InvalidOperationException or IndexOutOfRangeException)
            {
                // The points handed over before the failure are the scalar analyzer's results already (bit for bit).
                for (var j = columns.Count - before; j < lanes; j++)
                {
                    columns.Add(points[j], axes[j], Analyze(block.Scalar, initial[j], parameters[j]));
                }
            }

            token.ThrowIfCancellationRequested();
            progress?.Invoke(lanes);
        }

        return (columns, attractors);
    }

    /// <summary>A block's outcomes straight into the chunk's columns, at the block's points.</summary>
    private sealed class BlockRows(ChunkColumns columns, Specs.BlockSource source) : IPointRows
    {
        public void Add(int lane, PointResult result) => columns.Add(source.Points[lane], source.AxisValues[lane], result);

        public void Add(int lane, Regime regime, int period, ReadOnlySpan<double> lyapunov, ReadOnlySpan<double> lyapunovError, ReadOnlySpan<double> finalState, string? reason, ReadOnlySpan<double> samples) =>
            columns.Add(source.Points[lane], source.AxisValues[lane], regime, period, double.NaN, lyapunov, lyapunovError, finalState, null, reason, samples);
    }

    /// <summary>
    /// A continuation sweep: the chunk holds whole lines along the followed axis. Each line is swept forward
    /// from its first point's own initial state, every next point starting from the previous one's final
    /// state, then backward from the last forward state. Where the two branches end on different attractors
    /// (neither unresolved) the point is flagged as hysteretic. A point after a divergent one starts afresh
    /// from its own initial state. The row holds the forward branch, the backward_ columns the other.
    /// </summary>
    /// <remarks>
    /// Lines go to <paramref name="part"/> as row groups of whole lines (<see cref="PartStream.GroupRows"/>), the rows
    /// after the last full group are left in the columns returned.
    /// </remarks>
    private static (ChunkColumns Points, AttractorColumns Attractors) ComputeLines(
        RunContext context, long chunk, ChunkColumns columns, PartStream part, Action<long>? progress, CancellationToken token)
    {
        var spec = context.Spec;
        var grid = spec.Grid;
        var manifest = context.Run.Manifest;
        var length = grid.LineLength;
        var linesPerChunk = manifest.ChunkSize / length;
        var firstLine = chunk * linesPerChunk;
        var lastLine = Math.Min(grid.LineCount, firstLine + linesPerChunk);
        var analyzer = Probing.AnalyzerFactory.Create(spec, context.Model);
        var dimension = spec.Model.Variables.Count;
        var attractors = new AttractorColumns(dimension);
        var source = new Specs.PointSource(spec);
        var forward = new PointResult[length];
        var backward = new PointResult[length];
        var points = new long[length];
        for (var line = firstLine; line < lastLine; line++)
        {
            for (var step = 0L; step < length; step++)
            {
                points[step] = grid.LinePoint(line, step);
            }

            PointResult? previous = null;
            for (var step = 0L; step < length; step++)
            {
                source.Fill(points[step]);
                forward[step] = previous = Analyze(analyzer, Continued(previous, spec) ?? source.Initial, source.Parameters);
            }

            for (var step = length - 1; step >= 0; step--)
            {
                source.Fill(points[step]);
                backward[step] = previous = Analyze(analyzer, Continued(previous, spec) ?? source.Initial, source.Parameters);
            }

            if (columns.Count + length > part.GroupRows)
            {
                part.Append(columns);
            }

            for (var step = 0L; step < length; step++)
            {
                var point = points[step];
                source.Fill(point);
                var found = AttractorGrouping.Group([forward[step], backward[step]], spec.Analysis);
                var hysteresis = found.Count > 1 && forward[step].Regime != Regime.Unresolved && backward[step].Regime != Regime.Unresolved;
                columns.Add(point, source.AxisValues, forward[step], found.Count);
                columns.AddBackward(backward[step], hysteresis);
                foreach (var attractor in found)
                {
                    attractors.Add(point, attractor);
                }
            }

            token.ThrowIfCancellationRequested();
            progress?.Invoke(length);
        }

        return (columns, attractors);
    }

    /// <summary>
    /// The state a continuation carries on from: the previous point's final state (analyzers copy their start, so
    /// it is passed as it is), unless there is none or it escaped.
    /// </summary>
    private static double[]? Continued(PointResult? previous, Specs.SweepSpec spec) =>
        previous is { Regime: not Regime.Divergent } && PointResult.Bounded(previous.FinalState, spec.Analysis.Escape) ? previous.FinalState : null;

    /// <summary>Analyses one start; an analysis that throws becomes an unresolved result with the reason.</summary>
    public static PointResult Analyze(IPointAnalyzer analyzer, double[] initial, double[] parameters)
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
