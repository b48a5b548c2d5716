namespace Sweeps.Core.Tests;

/// <summary>Named tolerances, so that every comparison says which kind of agreement it expects.</summary>
internal static class Tolerance
{
    /// <summary>Exact identities evaluated in floating point over long orbits (relative).</summary>
    public const double Identity = 1e-9;

    /// <summary>Published exponents of chaotic maps after ~10^6 iterations (absolute).</summary>
    public const double PublishedMapExponent = 5e-3;

    /// <summary>Published Hénon exponents as tabulated (absolute).</summary>
    public const double PublishedHenonExponent = 3e-3;

    /// <summary>Published exponents of chaotic flows after T ≈ 10^4 (absolute).</summary>
    public const double PublishedFlowExponent = 0.01;

    /// <summary>Two floating-point evaluations of one formula by different routes (relative).</summary>
    public const double Rounding = 1e-12;

    /// <summary>A routine of Sweeps' own against the platform's, which rounds correctly in practice (units in the last place).</summary>
    public const long PlatformUlps = 1;

    /// <summary>The step-size rule's own fifth root against the platform's power (relative): a heuristic needs no more.</summary>
    public const double StepRule = 1e-10;

    /// <summary>How many representable doubles lie between two of the same sign.</summary>
    public static long Ulps(double a, double b) => Math.Abs(BitConverter.DoubleToInt64Bits(a) - BitConverter.DoubleToInt64Bits(b));

    public static void Close(double expected, double actual, double absolute, string? what = null)
    {
        Assert.True(
            Math.Abs(expected - actual) <= absolute,
            $"{what ?? "value"}: expected {expected:R} ± {absolute:g3}, got {actual:R}");
    }

    public static void Relative(double expected, double actual, double relative, string? what = null)
    {
        var scale = Math.Max(1, Math.Max(Math.Abs(expected), Math.Abs(actual)));
        Close(expected, actual, relative * scale, what);
    }
}
