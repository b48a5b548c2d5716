namespace Sweeps.Core.Analysis;

/// <summary>
/// The analysis of one point. Exponents are natural-log, per iteration for maps; −∞ marks a
/// superstable direction (an exact zero of the tangent map), NaN an exponent not computed.
/// </summary>
/// <param name="Regime">Attractor class.</param>
/// <param name="Period">Cycle length in iterations; 0 when no cycle was found.</param>
/// <param name="Lyapunov">Exponents, largest first; empty when not computed.</param>
/// <param name="LyapunovError">Convergence estimate per exponent: |mean over the first half − mean over the second half|.</param>
/// <param name="LogDetMean">Mean ln|det Df| along the measured orbit (NaN unless the full spectrum was computed); equals the exponents' sum.</param>
/// <param name="FinalState">The state after transient and measurement.</param>
/// <param name="Cycle">The cycle's points in orbit order when a period was found.</param>
/// <param name="DivergedAt">The iteration at which the orbit escaped, for divergent points.</param>
/// <param name="Reason">Why the point is unresolved or divergent, or a caution; null otherwise.</param>
/// <param name="Samples">The last states of the orbit, row-major (Samples × n).</param>
public sealed record PointResult(
    Regime Regime,
    int Period,
    double[] Lyapunov,
    double[] LyapunovError,
    double LogDetMean,
    double[] FinalState,
    IReadOnlyList<double[]> Cycle,
    long? DivergedAt,
    string? Reason,
    double[] Samples);
