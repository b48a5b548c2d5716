using Sweeps.Core.Analysis;
using Sweeps.Core.Kernels;

namespace Sweeps.Core.Tests.Kernels;

/// <summary>Two analyses of one point agree bit for bit: every number compared by its bits, every text exactly.</summary>
internal static class SameResult
{
    public static void Check(PointResult expected, PointResult actual, string where)
    {
        Assert.True(expected.Regime == actual.Regime && expected.Period == actual.Period, $"{where}: {expected.Regime}/{expected.Period} vs {actual.Regime}/{actual.Period}");
        Assert.True(Bits(expected.Lyapunov) == Bits(actual.Lyapunov), $"{where}: exponents {Bits(expected.Lyapunov)} vs {Bits(actual.Lyapunov)}");
        Assert.True(Bits(expected.LyapunovError) == Bits(actual.LyapunovError), $"{where}: errors");
        Assert.True(Bits([expected.LogDetMean]) == Bits([actual.LogDetMean]), $"{where}: mean log det");
        Assert.True(Bits(expected.FinalState) == Bits(actual.FinalState), $"{where}: final state");
        Assert.True(Bits(expected.Samples) == Bits(actual.Samples), $"{where}: samples");
        Assert.True(Bits(expected.Cycle.SelectMany(c => c).ToArray()) == Bits(actual.Cycle.SelectMany(c => c).ToArray()), $"{where}: cycle");
        Assert.True(expected.Reason == actual.Reason, $"{where}: reason '{expected.Reason}' vs '{actual.Reason}'");
        Assert.True(Bits(expected.Box?.Low ?? []) == Bits(actual.Box?.Low ?? []) && Bits(expected.Box?.High ?? []) == Bits(actual.Box?.High ?? []), $"{where}: box");
        Assert.True(Bits([expected.PeriodTime]) == Bits([actual.PeriodTime]), $"{where}: period time");
        Assert.True(Bits(Values(expected.Indicators)) == Bits(Values(actual.Indicators)), $"{where}: indicators");
        Assert.Equal(expected.DivergedAt, actual.DivergedAt);
    }

    /// <summary>
    /// Runs <paramref name="points"/> points through <paramref name="block"/> a block at a time and checks each against
    /// <paramref name="reference"/>: point k starts at <paramref name="start"/> with the one parameter r swept from
    /// <paramref name="from"/> to <paramref name="to"/>.
    /// </summary>
    public static void CheckEveryPoint(IBlockAnalyzer block, IPointAnalyzer reference, int points, double[] start, double from, double to, string where)
    {
        var size = block.BlockSize;
        var (initial, parameters, results) = (new double[size][], new double[size][], new PointResult[size]);
        for (var first = 0; first < points; first += size)
        {
            var count = FillBlock(initial, parameters, first, points, start, from, to);
            block.Analyze(initial, parameters, count, results);
            for (var i = 0; i < count; i++)
            {
                Check(reference.Analyze(initial[i], parameters[i]), results[i], $"{where}, r = {parameters[i][0]:R}");
            }
        }
    }

    /// <summary>
    /// As <see cref="CheckEveryPoint"/>, with the outcomes handed over as rows (<see cref="IPointRows"/>): each in order,
    /// whole results checked in full, fields against the reference's fields (a part keeps no cycle, box or mean log
    /// determinant). Returns how many came as fields.
    /// </summary>
    public static int CheckEveryRow(IBlockAnalyzer block, IPointAnalyzer reference, int points, double[] start, double from, double to, string where)
    {
        var size = block.BlockSize;
        var (initial, parameters, rows) = (new double[size][], new double[size][], new RecordedRows());
        var asFields = 0;
        for (var first = 0; first < points; first += size)
        {
            var count = FillBlock(initial, parameters, first, points, start, from, to);
            rows.Clear();
            block.Analyze(initial, parameters, count, rows);
            Assert.Equal(count, rows.Count);
            for (var i = 0; i < count; i++)
            {
                var expected = reference.Analyze(initial[i], parameters[i]);
                var (fields, actual) = rows[i];
                asFields += fields ? 1 : 0;
                Check(fields ? expected with { Cycle = [], Box = null, LogDetMean = double.NaN } : expected, actual, $"{where}, rows, r = {parameters[i][0]:R}");
            }
        }

        return asFields;
    }

    /// <summary>The block of points from <paramref name="first"/> on (as many as the arrays hold); returns how many.</summary>
    private static int FillBlock(double[][] initial, double[][] parameters, int first, int points, double[] start, double from, double to)
    {
        var count = Math.Min(initial.Length, points - first);
        for (var i = 0; i < count; i++)
        {
            initial[i] = start.ToArray();
            parameters[i] = [from + ((to - from) * (first + i) / (points - 1))];
        }

        return count;
    }

    /// <summary>Rows as they arrive; fields kept as a result without cycle, box or mean log determinant.</summary>
    private sealed class RecordedRows : List<(bool Fields, PointResult Result)>, IPointRows
    {
        public void Add(int lane, PointResult result)
        {
            Assert.Equal(Count, lane);
            Add((false, result));
        }

        public void Add(int lane, Regime regime, int period, ReadOnlySpan<double> lyapunov, ReadOnlySpan<double> lyapunovError, ReadOnlySpan<double> finalState, string? reason, ReadOnlySpan<double> samples)
        {
            Assert.Equal(Count, lane);
            Add((true, new PointResult(regime, period, lyapunov.ToArray(), lyapunovError.ToArray(), double.NaN, finalState.ToArray(), [], null, reason, samples.ToArray())));
        }
    }

    private static double[] Values(Core.Indicators.IndicatorValues? indicators) =>
        indicators is null ? [] : [indicators.K, indicators.PermutationEntropy, indicators.LempelZiv];

    private static string Bits(double[] values) => string.Join(",", values.Select(v => BitConverter.DoubleToInt64Bits(v).ToString("x16")));
}
