using Sweeps.Core.Analysis;
using Sweeps.Core.Kernels;
using Sweeps.Core.Models;

namespace Sweeps.Core.Tests.Kernels;

/// <summary>
/// The block kernel against the scalar analyzer: for every point, the same result bit for bit — regime, period,
/// exponents and their errors, final state, cycle, samples, box and reason — including points the kernel hands
/// back to the scalar path (escapes, superstable orbits, non-finite values) — with the generated loops on four-lane and
/// on eight-lane vectors (the eight-lane form runs on any processor; without 512-bit vectors it is only slower), and
/// with the outcomes handed over as results and as rows.
/// </summary>
public sealed class MapBlockAnalyzerTests
{
    public static TheoryData<string, string, double, double, double> Cases() => new()
    {
        // model, equation, parameter range, initial x
        { "logistic", "r*x*(1 - x)", 2.5, 4.2, 0.3 },
        { "logistic, superstable r = 2", "r*x*(1 - x)", 1.9, 2.1, 0.3 },
        { "cubic", "r*x - x^3", 1.0, 3.2, 0.4 },
        { "sine", "r*sin(pi*x)", 0.6, 1.0, 0.2 },
        { "gauss", "exp(-6.2*x^2) + r", -1.0, 1.0, 0.1 },
        { "reciprocal", "r - 1/(x^2 + 1) + x^(-2)/50", 0.5, 2.0, 0.7 },
        { "power", "r*x^1.5*(1 - x)", 3.0, 5.0, 0.6 },
    };

    [Theory]
    [MemberData(nameof(Cases))]
    public void Block_GivesTheScalarResult_BitForBit(string name, string equation, double from, double to, double start)
    {
        foreach (var width in new[] { 4, 8 })
        {
            CheckEveryPoint(name, equation, from, to, start, width);
        }
    }

    [Fact]
    public void Block_RefusesOtherVectorWidths()
    {
        var model = Maps.Map(["x"], ["r"], "r*x*(1 - x)");
        var settings = new AnalysisSettings(Transient: 10, Measure: 10, Lyapunov: LyapunovMode.Largest, MaxPeriod: 4);
        Assert.Throws<ArgumentOutOfRangeException>(() => new MapBlockAnalyzer(model, settings, width: 2));
    }

    private static void CheckEveryPoint(string name, string equation, double from, double to, double start, int width)
    {
        var model = Maps.Map(["x"], ["r"], equation);
        foreach (var settings in new[]
        {
            new AnalysisSettings(Transient: 500, Measure: 700, Lyapunov: LyapunovMode.Largest, MaxPeriod: 32, Samples: 8),
            new AnalysisSettings(Transient: 0, Measure: 50, Lyapunov: LyapunovMode.Spectrum, MaxPeriod: 64, Samples: 16),
            new AnalysisSettings(Transient: 300, Measure: 256, Lyapunov: LyapunovMode.None, MaxPeriod: 16, Samples: 4),
        })
        {
            var block = new MapBlockAnalyzer(model, settings, width: width);
            const int points = 77;
            SameResult.CheckEveryPoint(block, new MapAnalyzer(model, settings), points, [start], from, to, $"{name}, {width} lanes a vector, {settings}");

            // Not a comparison of the scalar path with itself: most points went through the kernel.
            Assert.True(block.Rechecked < points / 2, $"{name}: {block.Rechecked} of {points} points were handed to the scalar path");

            // As rows: every point the kernel classified itself handed over as fields, the others as results.
            var rows = new MapBlockAnalyzer(model, settings, width: width);
            var fields = SameResult.CheckEveryRow(rows, new MapAnalyzer(model, settings), points, [start], from, to, $"{name}, {width} lanes a vector, {settings}");
            Assert.Equal(points - rows.Rechecked, fields);
        }
    }
}
