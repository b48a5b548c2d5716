using Parquet;
using Parquet.Schema;

namespace Sweeps.Engine.Runs;

/// <summary>
/// The columns of a finished (or partial) run that maps and diffs need, read from its part files with
/// Parquet.Net and ordered by point index: axis values, regime, period, the largest exponent and,
/// when asked, the attractor samples of the first variable.
/// </summary>
public sealed class RunTable
{
    private RunTable(
        long[] point, double[][] axes, string[] regime, int[] period, double[] lyapunov, RowValues? samples,
        AttractorLabels? attractors = null, bool[]? hysteresis = null, RowValues? backwardSamples = null)
    {
        Hysteresis = hysteresis;
        BackwardSamples = backwardSamples;
        Attractors = attractors;
        Point = point;
        Axes = axes;
        Regime = regime;
        Period = period;
        Lyapunov = lyapunov;
        Samples = samples;
    }

    public int Count => Point.Length;

    public long[] Point { get; }

    /// <summary>Axis values per axis, per row.</summary>
    public double[][] Axes { get; }

    public string[] Regime { get; }

    public int[] Period { get; }

    /// <summary>lyapunov_1 per row (NaN when not computed).</summary>
    public double[] Lyapunov { get; }

    /// <summary>Per row, the samples of the first variable (null unless requested).</summary>
    public RowValues? Samples { get; }

    /// <summary>Continuation sweeps: per row, whether the forward and backward branches differ (null otherwise).</summary>
    public bool[]? Hysteresis { get; }

    /// <summary>Continuation sweeps: per row, the backward branch's samples of the first variable (null unless requested).</summary>
    public RowValues? BackwardSamples { get; }

    /// <summary>Per row, the grid-wide label of the point's attractor with the largest basin (null unless requested).</summary>
    public AttractorLabels? Attractors { get; }

    public static async Task<RunTable> ReadAsync(RunDirectory run, bool samples, CancellationToken token = default) =>
        await ReadAsync(run, samples, attractors: false, token);

    public static Task<RunTable> ReadAsync(RunDirectory run, bool samples, bool attractors, CancellationToken token = default) =>
        ReadAsync(run, run.PartsPath, samples, attractors, token);

    /// <summary>The points of refinement level <paramref name="level"/> (their point indices are on that level's lattice).</summary>
    public static Task<RunTable> ReadLevelAsync(RunDirectory run, int level, bool samples, CancellationToken token = default) =>
        ReadAsync(run, Path.Combine(run.LevelPath(level), "parts"), samples, attractors: false, token);

    /// <summary>
    /// The run's parts a table at a time, in part order — for a reader that needs every row once but never all of them
    /// at a time (a bifurcation diagram of 10^8 points). A table holds a part's row groups up to
    /// <see cref="BatchSamples"/> samples' entries (at least one row group), a whole part unless samples make it large:
    /// the samples of a part of a thousand samples a point are a gigabyte. With <paramref name="pointsAndSamplesOnly"/>
    /// only the point indices and the samples are read (a first pass after the samples' range); the other columns are
    /// then left at their default values.
    /// </summary>
    public static IAsyncEnumerable<RunTable> ReadEachPartAsync(RunDirectory run, bool samples, bool pointsAndSamplesOnly = false, CancellationToken token = default) =>
        ReadEachLevelPartAsync(run, 0, samples, pointsAndSamplesOnly, token);

    /// <summary>As <see cref="ReadEachPartAsync"/>, the parts of refinement level <paramref name="level"/> (0: the run's own).</summary>
    public static IAsyncEnumerable<RunTable> ReadEachLevelPartAsync(
        RunDirectory run, int level, bool samples, bool pointsAndSamplesOnly = false, CancellationToken token = default) =>
        ReadEachLevelPartAsync(run, level, samples, pointsAndSamplesOnly, BatchSamples, token);

    /// <summary>As above, with tables of at most <paramref name="batchSamples"/> samples' entries (unless a row group has more).</summary>
    internal static async IAsyncEnumerable<RunTable> ReadEachLevelPartAsync(
        RunDirectory run, int level, bool samples, bool pointsAndSamplesOnly, long batchSamples, [System.Runtime.CompilerServices.EnumeratorCancellation] CancellationToken token = default)
    {
        var layout = Layout.Of(run);
        var buffers = new SampleBuffers(0);
        foreach (var part in PartsIn(level == 0 ? run.PartsPath : Path.Combine(run.LevelPath(level), "parts")))
        {
            // One reader for all of a part's row groups: a part's footer grows with its row groups, and parsing it for each
            // of them took longer than reading them (a part of a thousand samples a point holds a hundred row groups).
            // The samples' read buffers too (tens of megabytes for a row group of a thousand samples a point: new ones for
            // every row group doubled the time of a bifurcation diagram).
            await using var reader = await ParquetReader.CreateAsync(part, null, token);
            for (var first = 0; first < reader.RowGroupCount;)
            {
                var count = samples ? Batch(reader, first, batchSamples) : reader.RowGroupCount - first;
                yield return await ReadAsync(run, layout, [part], samples, attractors: false, token, pointsAndSamplesOnly, groups: (first, count), open: reader, buffers: buffers);
                first += count;
            }
        }
    }

    /// <summary>
    /// As <see cref="ReadEachPartAsync"/>, each part with its points' attractor labels: one catalog across the parts, so
    /// that every part's labels are those of the whole run read at once (<see cref="ReadAsync(RunDirectory, bool, bool, CancellationToken)"/>).
    /// </summary>
    public static async IAsyncEnumerable<RunTable> ReadEachPartWithAttractorsAsync(
        RunDirectory run, bool samples, [System.Runtime.CompilerServices.EnumeratorCancellation] CancellationToken token = default)
    {
        var layout = Layout.Of(run);
        var labeller = new AttractorLabels.Labeller(run);
        foreach (var part in PartsIn(run.PartsPath))
        {
            yield return await ReadAsync(run, layout, [part], samples, attractors: true, token, labeller: labeller);
        }
    }

    /// <summary>The most samples' entries (values and empty lists) a table read part by part holds, unless a row group has more.</summary>
    internal const long BatchSamples = 1 << 22;

    /// <summary>How many row groups from <paramref name="first"/> on make the next table: up to <paramref name="most"/> entries, at least one group.</summary>
    private static int Batch(ParquetReader reader, int first, long most)
    {
        var (count, entries) = (0, 0L);
        var field = SamplesField(reader.Schema.DataFields, "samples");
        while (first + count < reader.RowGroupCount)
        {
            using var group = reader.OpenRowGroupReader(first + count);
            entries += group.GetMetadata(field)!.MetaData!.NumValues;
            if (count > 0 && entries > most)
            {
                break;
            }

            count++;
        }

        return count;
    }

    /// <summary>The row groups of a part to read: all, or the ones asked for.</summary>
    private static IEnumerable<int> Groups(ParquetReader reader, (int First, int Count)? groups) =>
        groups is { } some ? Enumerable.Range(some.First, some.Count) : Enumerable.Range(0, reader.RowGroupCount);

    private static string[] PartsIn(string folder) =>
        Directory.Exists(folder) ? Directory.EnumerateFiles(folder, "part-*.parquet").Order(StringComparer.Ordinal).ToArray() : [];

    private static Task<RunTable> ReadAsync(RunDirectory run, string folder, bool samples, bool attractors, CancellationToken token) =>
        ReadAsync(run, Layout.Of(run), PartsIn(folder), samples, attractors, token);

    /// <summary>What every part of a run holds: its axes' names, whether it has backward branches, its dimension.</summary>
    private sealed record Layout(IReadOnlyList<string> AxisNames, bool Branches, int Dimension)
    {
        public static Layout Of(RunDirectory run)
        {
            var spec = run.LoadSpec();
            return new Layout(SpecFingerprintAxes(run), spec.Grid.Follow is not null, spec.Model.Variables.Count);
        }
    }

    /// <param name="groups">Only these row groups of each part (all of them when null).</param>
    /// <param name="open">The reader of the one part given, kept open by the caller (each part is opened here otherwise).</param>
    /// <param name="buffers">Buffers for reading the samples, kept by the caller across calls (made here otherwise).</param>
    private static async Task<RunTable> ReadAsync(
        RunDirectory run, Layout layout, string[] parts, bool samples, bool attractors, CancellationToken token, bool pointsAndSamplesOnly = false,
        AttractorLabels.Labeller? labeller = null, (int First, int Count)? groups = null, ParquetReader? open = null, SampleBuffers? buffers = null)
    {
        var (axisNames, branches, dimension) = (layout.AxisNames, layout.Branches, layout.Dimension);

        // The footers first: every column is then sized once and read straight into place (growing lists and copying
        // them out cost more than the reading, for 10^7 rows).
        var (total, levels, values) = (0L, 0L, 0L);
        foreach (var part in parts)
        {
            await using var opened = open is null ? await ParquetReader.CreateAsync(part, null, token) : null;
            var reader = open ?? opened!;
            foreach (var g in Groups(reader, groups))
            {
                using var group = reader.OpenRowGroupReader(g);
                total += group.RowCount;
                if (samples)
                {
                    var entries = group.GetMetadata(SamplesField(reader.Schema.DataFields, "samples"))!.MetaData!.NumValues;
                    (levels, values) = (Math.Max(levels, entries), values + (entries / dimension));
                }
            }
        }

        var rows = checked((int)total);
        var points = new long[rows];
        var axes = axisNames.Select(_ => new double[rows]).ToArray();
        var regimes = new string[rows];
        var periods = new int[rows];
        var lyapunov = new double[rows];
        var hysteresis = branches ? new bool[rows] : null;
        var sampleRows = samples ? new RowValues.Builder(rows, values) : null;
        var backwardRows = branches && samples ? new RowValues.Builder(rows, values) : null;
        buffers = samples ? buffers ?? new SampleBuffers(checked((int)levels)) : null;
        var names = new Dictionary<string, string>(StringComparer.Ordinal);
        var at = 0;
        foreach (var part in parts)
        {
            await using var opened = open is null ? await ParquetReader.CreateAsync(part, null, token) : null;
            var reader = open ?? opened!;
            var fields = reader.Schema.DataFields;
            DataField Field(string name) => fields.First(f => f.Name == name);
            foreach (var g in Groups(reader, groups))
            {
                using var group = reader.OpenRowGroupReader(g);
                var count = (int)group.RowCount;
                await group.ReadAsync(Field("point"), points.AsMemory(at, count), null, token);
                for (var a = 0; a < axisNames.Count && !pointsAndSamplesOnly; a++)
                {
                    await group.ReadAsync(Field(axisNames[a]), axes[a].AsMemory(at, count), null, token);
                }

                if (!pointsAndSamplesOnly)
                {
                    await group.ReadAsync(Field("regime"), regimes.AsMemory(at, count)!, null, token);
                    Share(regimes.AsSpan(at, count), names);
                    await group.ReadAsync(Field("period"), periods.AsMemory(at, count), null, token);
                    await group.ReadAsync(Field("lyapunov_1"), lyapunov.AsMemory(at, count), null, token);
                }

                if (sampleRows is not null)
                {
                    await ReadSamples(group, SamplesField(fields, "samples"), dimension, buffers!, sampleRows, token);
                }

                if (hysteresis is not null && !pointsAndSamplesOnly)
                {
                    await group.ReadAsync(Field("hysteresis"), hysteresis.AsMemory(at, count), null, token);
                }

                if (backwardRows is not null)
                {
                    await ReadSamples(group, SamplesField(fields, "backward_samples"), dimension, buffers!, backwardRows, token);
                }

                at += count;
            }
        }

        // Parts hold ascending point ranges and are read in order, so the rows are usually sorted already: then the
        // columns are kept as they are (sorting 10^7 rows through an index permutation took seconds and twice the memory).
        var sorted = true;
        for (var i = 1; i < rows && sorted; i++)
        {
            sorted = points[i - 1] <= points[i];
        }

        var order = sorted ? null : Enumerable.Range(0, rows).OrderBy(i => points[i]).ToArray();
        T[] Sorted<T>(T[] column) => order is null ? column : order.Select(i => column[i]).ToArray();
        RowValues Rows(RowValues.Builder list) => order is null ? list.Build() : list.Build().Reorder(order);
        return new RunTable(
            Sorted(points),
            axes.Select(Sorted).ToArray(),
            Sorted(regimes),
            Sorted(periods),
            Sorted(lyapunov),
            sampleRows is null ? null : Rows(sampleRows),
            !attractors ? null : labeller is null ? await AttractorLabels.ReadAsync(run, Sorted(points), token) : await labeller.LabelPartAsync(parts.Single(), Sorted(points), token),
            hysteresis is null ? null : Sorted(hysteresis),
            backwardRows is null ? null : Rows(backwardRows));
    }

    private static DataField SamplesField(DataField[] fields, string name) =>
        fields.First(f => f.Path.ToString().StartsWith(name, StringComparison.Ordinal));

    /// <summary>One string object per distinct regime name: the reader gives each row its own, ten million of them for 10^7 rows.</summary>
    private static void Share(Span<string> values, Dictionary<string, string> names)
    {
        for (var i = 0; i < values.Length; i++)
        {
            if (values[i] is { } value)
            {
                values[i] = names.TryGetValue(value, out var shared) ? shared : names[value] = value;
            }
        }
    }

    /// <summary>The value and level buffers of a samples column chunk, kept for the next chunk.</summary>
    private sealed class SampleBuffers(int size)
    {
        public double[] Values { get; private set; } = new double[size];

        public int[] Definitions { get; private set; } = new int[size];

        public int[] Repetitions { get; private set; } = new int[size];

        /// <summary>Makes room for <paramref name="levels"/> level entries (a backward branch's chunk can hold more than the forward one's).</summary>
        public void Fit(int levels)
        {
            if (levels > Values.Length)
            {
                (Values, Definitions, Repetitions) = (new double[levels], new int[levels], new int[levels]);
            }
        }
    }

    /// <summary>A table of no rows (a run with no part written yet).</summary>
    public static RunTable Empty(int axes) => new([], Enumerable.Range(0, axes).Select(_ => Array.Empty<double>()).ToArray(), [], [], [], null);

    /// <summary>
    /// The rows of several tables one after another (for drawing refinement levels together). Point indices
    /// keep their own tables' meaning; attractor labels and continuation columns are dropped.
    /// </summary>
    public static RunTable Merge(IReadOnlyList<RunTable> tables)
    {
        T[] All<T>(Func<RunTable, T[]> column) => tables.SelectMany(column).ToArray();
        var samples = tables.All(t => t.Samples is not null) ? RowValues.Concat(tables.Select(t => t.Samples!).ToArray()) : null;
        return new RunTable(
            All(t => t.Point),
            Enumerable.Range(0, tables[0].Axes.Length).Select(a => All(t => t.Axes[a])).ToArray(),
            All(t => t.Regime),
            All(t => t.Period),
            All(t => t.Lyapunov),
            samples);
    }

    private static IReadOnlyList<string> SpecFingerprintAxes(RunDirectory run) =>
        run.Manifest.Spec["grid"]!.AsArray().Select(a => a!["name"]!.GetValue<string>()).ToArray();

    internal static async Task<T[]> Read<T>(ParquetRowGroupReader group, DataField field, int rows, CancellationToken token)
        where T : struct
    {
        var values = new T[rows];
        await group.ReadAsync<T>(field, values, null, token);
        return values;
    }

    /// <summary>
    /// Appends the list rows rebuilt from the column's levels — repetition 0 starts a row, definition 2 is a value, 1 an
    /// empty list — keeping the first variable's value of each state.
    /// </summary>
    private static async Task ReadSamples(ParquetRowGroupReader group, DataField field, int dimension, SampleBuffers buffers, RowValues.Builder rows, CancellationToken token)
    {
        // The chunk's value count counts level entries (values plus empty lists).
        var count = (int)group.GetMetadata(field)!.MetaData!.NumValues;
        buffers.Fit(count);
        var (valueBuffer, definitionBuffer, repetitionBuffer) = (buffers.Values, buffers.Definitions, buffers.Repetitions);
        await group.ReadRawAsync<double>(field, valueBuffer.AsMemory(0, count), definitionBuffer.AsMemory(0, count), repetitionBuffer.AsMemory(0, count), token);
        var (first, values) = (0, 0);
        for (var i = 0; i <= count; i++)
        {
            if (i == count || (repetitionBuffer[i] == 0 && i > 0))
            {
                if (i > 0)
                {
                    rows.Add(valueBuffer, first, (values - first) / dimension, dimension);
                }

                first = values;
            }

            if (i < count && definitionBuffer[i] == 2)
            {
                values++;
            }
        }
    }
}
