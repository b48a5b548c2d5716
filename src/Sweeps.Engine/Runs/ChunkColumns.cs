using System.Buffers;
using Sweeps.Core.Analysis;

namespace Sweeps.Engine.Runs;

/// <summary>The results of one chunk, column by column, ready for a part file. Sized once per chunk.</summary>
internal sealed class ChunkColumns
{
    private readonly int n;

    public ChunkColumns(int capacity, int axes, int dimension, bool indicators = false, bool branches = false, int samples = 0)
    {
        // Sized for the samples a row holds at most, so the list never regrows while a chunk is computed.
        var values = (long)capacity * Math.Max(1, samples * dimension);
        SampleValues = new ArrayBufferWriter<double>((int)Math.Clamp(values, 1, 1 << 27));
        SampleCounts = new int[capacity];
        Hysteresis = branches ? new bool[capacity] : [];
        Backward = branches ? new ChunkColumns(capacity, 0, dimension, samples: samples) : null;
        Indicators = Columns(indicators ? 3 : 0, capacity);
        n = dimension;
        Point = new long[capacity];
        Axis = Columns(axes, capacity);
        Regime = new string[capacity];
        Period = new int[capacity];
        PeriodTime = new double[capacity];
        Attractors = new int[capacity];
        Lyapunov = Columns(dimension, capacity);
        LyapunovError = Columns(dimension, capacity);
        Final = Columns(dimension, capacity);
        ReasonBytes = new ArrayBufferWriter<byte>(Math.Max(1, capacity));
        ReasonStart = new int[capacity];
        ReasonLength = new int[capacity];
    }

    /// <summary>Columns for <paramref name="capacity"/> rows of <paramref name="spec"/>'s parts (with the backward branch when asked).</summary>
    public static ChunkColumns For(Specs.SweepSpec spec, int capacity, bool branches = false) =>
        new(capacity, spec.Grid.Axes.Count, spec.Model.Variables.Count, spec.Analysis.Indicators, branches, spec.Analysis.Samples);

    /// <summary>Columns for <paramref name="capacity"/> rows of a part of <paramref name="schema"/> (read back; the samples' list grows as needed).</summary>
    public static ChunkColumns For(PartSchema schema, int capacity) =>
        new(capacity, schema.Axes.Count, schema.Final.Count, schema.Indicators.Count > 0, schema.HasBranches);

    /// <summary>The most rows a row group of a streamed part holds (a page of a numeric column: <see cref="Columnar.ColumnarFile.PageValues"/>).</summary>
    public const int MaxGroupRows = Columnar.ColumnarFile.PageValues;

    /// <summary>
    /// About the most memory a row group's columns take (<see cref="GroupRows"/>): samples make a row large — a thousand
    /// per point are 8 KB — and a chunk's rows, held at once, were a gigabyte per worker at that.
    /// </summary>
    public const int GroupBytes = 8 << 20;

    /// <summary>
    /// Rows in a row group of a streamed part of <paramref name="spec"/> (<see cref="PartStream"/>): as many as fit in
    /// <see cref="GroupBytes"/> of columns, at most <see cref="MaxGroupRows"/>, in whole blocks of 32 points (every
    /// block analyzer's block divides it, so row groups end where blocks do) — for a continuation sweep, whose rows carry
    /// both branches, in whole lines along the followed axis (at least one, however long). A function of the spec alone:
    /// the same chunk is always cut the same way, and its part is the same bytes.
    /// </summary>
    public static int GroupRows(Specs.SweepSpec spec)
    {
        const int block = 32;
        var n = spec.Model.Variables.Count;
        var row = sizeof(long) + (sizeof(double) * spec.Grid.Axes.Count) + IntPtr.Size + sizeof(int) + sizeof(double) + sizeof(int)
            + (3 * sizeof(double) * n) + (spec.Analysis.Indicators ? 3 * sizeof(double) : 0) + (3 * sizeof(int))
            + (sizeof(double) * spec.Analysis.Samples * n);
        if (spec.Grid.Follow is null)
        {
            return (int)Math.Clamp(GroupBytes / row / block * block, block, MaxGroupRows);
        }

        // The backward branch's columns are as large as the forward one's, and a flag besides.
        var line = spec.Grid.LineLength;
        return checked((int)(Math.Max(1, Math.Min(GroupBytes / ((2 * row) + 1), MaxGroupRows) / line) * line));
    }

    public int Count { get; private set; }

    /// <summary>Rows the columns hold at most.</summary>
    public int Capacity => Point.Length;

    /// <summary>Empties the columns for reuse (rows are overwritten as they are added again).</summary>
    public void Clear()
    {
        Count = 0;
        SampleValues.ResetWrittenCount();
        ReasonBytes.ResetWrittenCount();
        Backward?.Clear();
    }

    /// <summary>Sets the row count after the columns were filled directly (by a reader).</summary>
    public void SetCount(int count) => Count = count;

    public long[] Point { get; }

    public double[][] Axis { get; }

    public string[] Regime { get; }

    public int[] Period { get; }

    public double[] PeriodTime { get; }

    public int[] Attractors { get; }

    public double[][] Lyapunov { get; }

    public double[][] LyapunovError { get; }

    public double[][] Final { get; }

    /// <summary>K, permutation entropy, Lempel–Ziv complexity (empty unless indicators are on).</summary>
    public double[][] Indicators { get; }

    /// <summary>
    /// The reasons' text, UTF-8, one row after the other (<see cref="ReasonStart"/> and <see cref="ReasonLength"/> say
    /// where each is; a length of −1 is no reason). Kept as bytes rather than strings: a reason names its point's numbers,
    /// so each is a new string, and strings held by a chunk's columns outlive the collector's youngest generation —
    /// promoting its memory instead of reusing it, so that every later allocation of the sweep touched fresh pages
    /// (docs/performance.md, eighth session).
    /// </summary>
    public ArrayBufferWriter<byte> ReasonBytes { get; }

    /// <summary>Where each row's reason starts in <see cref="ReasonBytes"/>.</summary>
    public int[] ReasonStart { get; }

    /// <summary>Each row's reason's length in bytes, −1 for none.</summary>
    public int[] ReasonLength { get; }

    /// <summary>The reason of <paramref name="row"/>, or null.</summary>
    public string? Reason(int row) =>
        ReasonLength[row] < 0 ? null : System.Text.Encoding.UTF8.GetString(ReasonBytes.WrittenSpan.Slice(ReasonStart[row], ReasonLength[row]));

    /// <summary>The reasons of the first <paramref name="count"/> rows as strings.</summary>
    public string?[] Reasons(int count)
    {
        var reasons = new string?[count];
        for (var row = 0; row < count; row++)
        {
            reasons[row] = Reason(row);
        }

        return reasons;
    }

    /// <summary>Sets the reason of <paramref name="row"/>; rows are set in order (each reason's bytes follow the last).</summary>
    public void SetReason(int row, string? reason)
    {
        ReasonStart[row] = ReasonBytes.WrittenCount;
        if (reason is null)
        {
            ReasonLength[row] = -1;
            return;
        }

        var length = System.Text.Encoding.UTF8.GetBytes(reason, ReasonBytes.GetSpan(System.Text.Encoding.UTF8.GetMaxByteCount(reason.Length)));
        ReasonBytes.Advance(length);
        ReasonLength[row] = length;
    }

    /// <summary>Continuation sweeps: whether the two branches differ at the row's point (empty otherwise).</summary>
    public bool[] Hysteresis { get; }

    /// <summary>Continuation sweeps: the backward branch, row for row (null otherwise).</summary>
    public ChunkColumns? Backward { get; }

    /// <summary>The sample values of all rows, one row after the other (<see cref="SampleCounts"/> says how many each).</summary>
    public ArrayBufferWriter<double> SampleValues { get; }

    /// <summary>
    /// How many sample values each row has (0: an empty list). The list column's Parquet levels follow from these when
    /// a part is written (<see cref="Columnar.ListLevels"/>); kept as counts, a chunk's columns take a third less memory, and
    /// fresh memory is what the first chunks of a run pay for, page by page.
    /// </summary>
    public int[] SampleCounts { get; }

    public void Add(long point, ReadOnlySpan<double> axisValues, PointResult result, int attractors = 1) =>
        Add(point, axisValues, result.Regime, result.Period, result.PeriodTime, result.Lyapunov, result.LyapunovError, result.FinalState, result.Indicators, result.Reason, result.Samples, attractors);

    /// <summary>Adds a row from the fields of a point's outcome (<see cref="PointResult"/>'s), with one start.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public void Add(
        long point,
        ReadOnlySpan<double> axisValues,
        Regime regime,
        int period,
        double periodTime,
        ReadOnlySpan<double> lyapunov,
        ReadOnlySpan<double> lyapunovError,
        ReadOnlySpan<double> finalState,
        Core.Indicators.IndicatorValues? indicators,
        string? reason,
        ReadOnlySpan<double> samples,
        int attractors = 1)
    {
        var row = Count++;
        Attractors[row] = attractors;
        Point[row] = point;
        for (var a = 0; a < Axis.Length; a++)
        {
            Axis[a][row] = axisValues[a];
        }

        Regime[row] = regime.ToText();
        Period[row] = period;
        PeriodTime[row] = periodTime;
        for (var i = 0; i < n; i++)
        {
            Lyapunov[i][row] = i < lyapunov.Length ? lyapunov[i] : double.NaN;
            LyapunovError[i][row] = i < lyapunovError.Length ? lyapunovError[i] : double.NaN;
            Final[i][row] = finalState[i];
        }

        if (Indicators.Length > 0)
        {
            Indicators[0][row] = indicators?.K ?? double.NaN;
            Indicators[1][row] = indicators?.PermutationEntropy ?? double.NaN;
            Indicators[2][row] = indicators?.LempelZiv ?? double.NaN;
        }

        SetReason(row, reason);
        SampleCounts[row] = samples.Length;
        SampleValues.Write(samples);
    }

    /// <summary>Adds the backward branch of the row just added.</summary>
    public void AddBackward(PointResult result, bool hysteresis)
    {
        Hysteresis[Count - 1] = hysteresis;
        Backward!.Add(Point[Count - 1], [], result);
    }

    /// <summary>Walks the samples one row at a time.</summary>
    public sealed class SampleCursor(ChunkColumns columns)
    {
        private int value;
        private int row;

        /// <summary>Replaces the contents of <paramref name="target"/> with the next row's samples.</summary>
        public void Next(List<double> target)
        {
            target.Clear();
            var count = columns.SampleCounts[row++];
            foreach (var sample in columns.SampleValues.WrittenSpan.Slice(value, count))
            {
                target.Add(sample);
            }

            value += count;
        }
    }

    private static double[][] Columns(int count, int capacity)
    {
        var columns = new double[count][];
        for (var i = 0; i < count; i++)
        {
            columns[i] = new double[capacity];
        }

        return columns;
    }
}
