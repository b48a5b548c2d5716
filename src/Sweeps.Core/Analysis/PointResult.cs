namespace Sweeps.Core.Analysis;

/// <summary>
/// The analysis of one point. Exponents are natural-log, per iteration (maps) or per unit time (flows); −∞ marks a
/// superstable direction (an exact zero of the tangent map), NaN an exponent not computed.
/// </summary>
/// <param name="Regime">Attractor class.</param>
/// <param name="Period">Cycle length in iterations (maps), section returns (autonomous flows) or forcing periods (forced flows); 0 when none.</param>
/// <param name="Lyapunov">Exponents, largest first; empty when not computed.</param>
/// <param name="LyapunovError">Convergence estimate per exponent: |mean over the first half − mean over the second half|.</param>
/// <param name="LogDetMean">Maps: mean ln|det Df|; flows: time-averaged ∇·f — along the measured orbit (NaN unless the full spectrum was computed); equals the exponents' sum.</param>
/// <param name="FinalState">The state after transient and measurement.</param>
/// <param name="Cycle">The cycle's points in orbit order when a period was found.</param>
/// <param name="DivergedAt">The iteration (maps) or integration step (flows) at which the orbit escaped, for divergent points.</param>
/// <param name="Reason">Why the point is unresolved or divergent, or a caution; null otherwise.</param>
/// <param name="Samples">The last states of the orbit (maps) or section points (flows), row-major (Samples × n).</param>
/// <param name="PeriodTime">Flows: the duration of the cycle in time units; NaN for maps and when no cycle was found.</param>
/// <param name="Indicators">Second-opinion indicators, when asked for (maps).</param>
/// <param name="Box">The smallest box holding the last recorded states (the period test's window: orbit points for maps, section points for flows); the final state alone when none were recorded. Null for stopped points.</param>
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
    double[] Samples,
    double PeriodTime = double.NaN,
    Indicators.IndicatorValues? Indicators = null,
    StateBox? Box = null)
{
    /// <summary>A point whose analysis stopped early (divergent or unresolved): exponents NaN, no cycle, no samples.</summary>
    public static PointResult Stopped(Regime regime, int exponents, double[] state, long? divergedAt, string reason)
    {
        var nan = new double[exponents];
        Array.Fill(nan, double.NaN);
        return new PointResult(regime, 0, nan, nan.ToArray(), double.NaN, state, [], divergedAt, reason, []);
    }

    /// <summary>Whether every component is finite and within ±<paramref name="escape"/>.</summary>
    public static bool Bounded(ReadOnlySpan<double> values, double escape)
    {
        foreach (var value in values)
        {
            if (!(Math.Abs(value) <= escape))
            {
                return false;
            }
        }

        return true;
    }
}
