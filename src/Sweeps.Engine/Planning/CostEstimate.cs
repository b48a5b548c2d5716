using System.Diagnostics;
using Sweeps.Core.Analysis;
using Sweeps.Engine.Probing;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Planning;

/// <summary>
/// Estimates the compute cost of a sweep by timing the analysis of a few points spread evenly over
/// the grid, after a warm-up, averaging the middle half of the timings (times the analyses per point: starts, or the two directions of a continuation sweep). Cost per point varies across a grid
/// (divergent points stop early, chaotic ones do not), so this is a guide, not a promise.
/// </summary>
public sealed record CostEstimate(int SampledPoints, double SecondsPerPoint, double TotalCpuSeconds)
{
    /// <summary>Points the analysis takes at a time: a block analyzer's lanes, else 1.</summary>
    public int BlockSize { get; init; } = 1;

    public static CostEstimate Measure(SweepSpec spec, int samples = 12) => Measure(spec, ModelFactory.Build(spec), samples: samples);

    /// <summary>
    /// As <see cref="Measure(SweepSpec, int)"/> with the spec's model already built (its compiled kernels are then reused by
    /// whoever computes with it). <paramref name="quick"/>: a block kernel is timed after one warm-up block instead of a
    /// few tenths of a second of them — code the runtime has not optimised yet then weighs in, so the figure errs high,
    /// which only ever makes planned chunks smaller; <c>run</c> plans with it and starts sooner.
    /// </summary>
    public static CostEstimate Measure(SweepSpec spec, Core.Models.Model model, bool quick = false, int samples = 12)
    {
        var lean = !spec.GroupsAttractors;
        if (AnalyzerFactory.CreateBlock(spec, model, lean) is { } block)
        {
            return MeasureBlocks(spec, block, quick);
        }

        var analyzer = AnalyzerFactory.Create(spec, model, lean);
        var points = spec.Grid.PointCount;
        var count = (int)Math.Min(samples, points);
        var source = new PointSource(spec);

        // Warm-up: the first analyses run while the JIT is still compiling and optimising.
        for (var i = 0; i < (quick ? 1 : 3); i++)
        {
            source.Fill(0);
            analyzer.Analyze(source.Initial, source.Parameters);
        }

        // Evenly spaced points, visited so that those timed so far are always spread over the grid; a quick estimate
        // stops after a few hundredths of a second (points of slow flows take milliseconds each).
        var clock = Stopwatch.StartNew();
        var times = new List<double>(count);
        foreach (var i in SpreadOrder(count))
        {
            if (quick && times.Count >= QuickMinimum && clock.Elapsed.TotalSeconds > QuickBudget)
            {
                break;
            }

            source.Fill(count == 1 ? 0 : (long)((double)i * (points - 1) / (count - 1)));
            var started = clock.Elapsed.TotalSeconds;
            analyzer.Analyze(source.Initial, source.Parameters);
            times.Add(clock.Elapsed.TotalSeconds - started);
        }

        // The mean of the middle half: robust to a late JIT pause, still sensitive to expensive regions.
        times.Sort();
        var timed = times.Count;
        var middle = times.Skip(timed / 4).Take(Math.Max(1, timed - (2 * (timed / 4)))).ToArray();
        // Every start of a point is a full analysis, and a continuation sweep analyses each point twice.
        var perPoint = middle.Average() * spec.AnalysesPerPoint;
        return new CostEstimate(timed, perPoint, perPoint * points);
    }

    /// <summary>
    /// Fewest points a quick estimate times, and the time after which it stops timing more. The figure sizes chunks only
    /// where it puts a chunk under <see cref="ChunkPlan.EmbeddedMinSeconds"/> or over <see cref="ChunkPlan.TargetSeconds"/>
    /// (the chunks per worker decide otherwise), so a rough one does; 40 ms of timing had been a tenth of a
    /// 400-point Dormand–Prince run's wall time (docs/performance.md, fourteenth session).
    /// </summary>
    private const int QuickMinimum = 4;

    private const double QuickBudget = 0.01;

    /// <summary>
    /// 0 … <paramref name="count"/> − 1, the two ends first, then the rest in the order of their bit-reversed index (the
    /// van der Corput sequence): every prefix is spread over the whole range, so an estimate that stops early has still
    /// seen both ends of the grid and points between them.
    /// </summary>
    internal static IEnumerable<int> SpreadOrder(int count)
    {
        if (count <= 0)
        {
            yield break;
        }

        yield return 0;
        if (count == 1)
        {
            yield break;
        }

        yield return count - 1;
        var bits = 0;
        while ((1 << bits) < count)
        {
            bits++;
        }

        for (var k = 0; k < 1 << bits; k++)
        {
            var reversed = 0;
            for (var b = 0; b < bits; b++)
            {
                reversed |= ((k >> b) & 1) << (bits - 1 - b);
            }

            if (reversed > 0 && reversed < count - 1)
            {
                yield return reversed;
            }
        }
    }

    /// <summary>Points a block kernel computes: a warm-up block, then blocks of points spread over the grid, timed as chunks run them.</summary>
    internal static CostEstimate MeasureBlocks(SweepSpec spec, Core.Kernels.IBlockAnalyzer block, bool quick)
    {
        var size = block.BlockSize;
        var points = spec.Grid.PointCount;
        var source = new BlockSource(spec, size);
        var (initial, parameters, results) = (source.Initial, source.Parameters, new PointResult[size]);
        void Fill(long first, int lanes) =>
            source.Fill(lanes, j => Math.Min(points - 1, first + ((long)j * Math.Max(1, points / (4 * size)))));

        // Warm-up: long enough for tiered compilation to have optimised the per-point code too (it promotes
        // methods after ~30 calls and a 100 ms delay; before that the estimate is several times pessimistic).
        // Large grids are worth the 0.3 s for a careful figure; for small ones a rough figure will do. A quick one
        // warms up on one block, the first call that compiles the kernels: no budget short of the 100 ms would let
        // tiering promote anything, the installed build does not tier (the per-point code is compiled optimised at
        // once), and `run` waits for the estimate before its first chunk.
        var lanes = (int)Math.Min(size, points);
        Fill(0, lanes);
        var warmUp = Stopwatch.StartNew();
        var budget = quick ? 0 : points > 100_000 ? 0.3 : 0.02;
        do
        {
            block.Analyze(initial, parameters, lanes, results);
        }
        while (warmUp.Elapsed.TotalSeconds < budget);

        // Four places along the grid, each timed five times; the median of each (a block is short enough for one
        // collection or a background compilation to multiply its time). A quick estimate stops once its time budget is
        // spent, after two places at least: blocks of slow points (a flow's block takes 10–50 ms) are long enough for
        // one timing each, and the run waits for the estimate before its first chunk. It times a block up to eight times
        // and keeps the fastest: it runs while the queue and the part writer warm up on the other threads, so a block
        // of cheap points (tens of microseconds) is often interrupted, and noise only ever adds time — the median of
        // three put a 10^6-point map sweep at 1.5 to 9 times its real cost (docs/performance.md, tenth session).
        var total = 0.0;
        const int Blocks = 4;
        var places = 0;
        var spent = Stopwatch.StartNew();

        // The places in the points' spread order (both ends first), so that two of them already span the grid.
        foreach (var place in SpreadOrder(Blocks))
        {
            if (quick && places >= 2 && spent.Elapsed.TotalSeconds > QuickBudget)
            {
                break;
            }

            Fill(points * place / Blocks, lanes);
            var times = new double[quick ? 8 : 5];
            var taken = 0;
            while (taken < times.Length && !(quick && taken > 0 && spent.Elapsed.TotalSeconds > QuickBudget))
            {
                var clock = Stopwatch.StartNew();
                block.Analyze(initial, parameters, lanes, results);
                times[taken++] = clock.Elapsed.TotalSeconds;
            }

            Array.Sort(times, 0, taken);
            total += quick ? times[0] : times[taken / 2];
            places++;
        }

        var perPoint = total / (places * lanes);
        return new CostEstimate(places * lanes, perPoint, perPoint * points) { BlockSize = size };
    }
}
