using System.Diagnostics;
using Sweeps.Core.Analysis;
using Sweeps.Engine.Config;
using Sweeps.Engine.Probing;
using Sweeps.Engine.Specs;

namespace Sweeps.Benchmarks;

/// <summary>
/// Analyses every point of a config's grid with the core analyzer on N threads (contiguous ranges,
/// one analyzer per thread) and prints points/s — and when each thread finished, to see an uneven split: the yardstick
/// for the queue and Parquet overhead.
/// </summary>
internal static class DirectLoop
{
    public static void Run(string configPath, int workers)
    {
        var spec = SpecReader.Load(configPath);
        var model = ModelFactory.Build(spec);
        var points = spec.Grid.PointCount;
        var checksums = new double[workers];
        var busy = new double[workers];
        var clock = Stopwatch.StartNew();
        var threads = Enumerable.Range(0, workers).Select(w => new Thread(() =>
        {
            var source = new PointSource(spec);
            var (first, last) = (points * w / workers, points * (w + 1) / workers);
            var sum = 0.0;
            static double Check(PointResult result) =>
                result.Period + (result.Lyapunov.Length > 0 && double.IsFinite(result.Lyapunov[0]) ? result.Lyapunov[0] : 0);
            // Lean results, as chunks of single-start sweeps compute them.
            if (AnalyzerFactory.CreateBlock(spec, model, lean: true) is { } block)
            {
                // The block kernel, as chunks use it: outcomes handed over as rows.
                var size = block.BlockSize;
                var lanesSource = new BlockSource(spec, size);
                var rows = new ChecksumRows();
                for (var point = first; point < last; point += size)
                {
                    var lanes = (int)Math.Min(size, last - point);
                    var start = point;
                    lanesSource.Fill(lanes, j => start + j);
                    block.Analyze(lanesSource.Initial, lanesSource.Parameters, lanes, rows);
                }

                sum = rows.Sum;
            }
            else
            {
                var analyzer = AnalyzerFactory.Create(spec, model, lean: true);
                for (var point = first; point < last; point++)
                {
                    source.Fill(point);
                    sum += Check(analyzer.Analyze(source.Initial, source.Parameters));
                }
            }

            checksums[w] = sum;
            busy[w] = clock.Elapsed.TotalSeconds;
        })).ToList();
        threads.ForEach(t => t.Start());
        threads.ForEach(t => t.Join());
        var seconds = clock.Elapsed.TotalSeconds;
        Console.WriteLine(FormattableString.Invariant(
            $"direct {points} points {seconds:F2} s {points / seconds:F0} points/s checksum {checksums.Sum():G6} collections {GC.CollectionCount(0)}/{GC.CollectionCount(1)}/{GC.CollectionCount(2)} allocated {GC.GetTotalAllocatedBytes() / 1048576} MiB paused {GC.GetTotalPauseDuration().TotalSeconds:F3} s threads done at {string.Join(" ", busy.Select(b => b.ToString("F2", System.Globalization.CultureInfo.InvariantCulture)))} s"));
    }

    /// <summary>Outcomes reduced to the checksum the results give (period plus a finite largest exponent).</summary>
    private sealed class ChecksumRows : IPointRows
    {
        public double Sum { get; private set; }

        public void Add(int lane, PointResult result) =>
            Sum += result.Period + (result.Lyapunov.Length > 0 && double.IsFinite(result.Lyapunov[0]) ? result.Lyapunov[0] : 0);

        public void Add(int lane, Regime regime, int period, ReadOnlySpan<double> lyapunov, ReadOnlySpan<double> lyapunovError, ReadOnlySpan<double> finalState, string? reason, ReadOnlySpan<double> samples) =>
            Sum += period + (lyapunov.Length > 0 && double.IsFinite(lyapunov[0]) ? lyapunov[0] : 0);
    }
}
