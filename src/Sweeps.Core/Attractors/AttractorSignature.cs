using Sweeps.Core.Analysis;

namespace Sweeps.Core.Attractors;

/// <summary>
/// What identifies an attractor when two orbits are compared: its regime and period, a representative
/// state, the box its recorded states fill and its largest exponent. For a cycle (or fixed point) the
/// representative is the cycle point that comes first in lexicographic order, so the same cycle reached
/// in a different phase gives the same representative; for other attractors it is the final state.
/// </summary>
/// <param name="Regime">The attractor's class.</param>
/// <param name="Period">Its period (0 when none).</param>
/// <param name="State">A representative state.</param>
/// <param name="Box">The box its recorded states fill.</param>
/// <param name="Exponent">Largest Lyapunov exponent (NaN when not computed).</param>
/// <param name="ExponentError">That exponent's convergence estimate (NaN when not computed).</param>
public sealed record AttractorSignature(Regime Regime, int Period, double[] State, StateBox Box, double Exponent, double ExponentError)
{
    public static AttractorSignature Of(PointResult result, double tolerance)
    {
        var cycle = result.Cycle;
        var state = cycle.Count > 0 ? First(cycle, Math.Sqrt(tolerance)) : result.FinalState;
        var box = cycle.Count > 0 ? StateBox.Of(cycle) : result.Box ?? StateBox.Point(result.FinalState);
        var exponent = result.Lyapunov.Length > 0 ? result.Lyapunov[0] : double.NaN;
        var error = result.LyapunovError.Length > 0 ? result.LyapunovError[0] : double.NaN;
        return new AttractorSignature(result.Regime, result.Period, state.ToArray(), box, exponent, error);
    }

    /// <summary>
    /// Whether <paramref name="other"/> is the same attractor. Both need the same regime and period.
    /// Cycles and fixed points: representatives and boxes agree within √tolerance (absolute plus
    /// relative, as in the period test, where √tolerance separates distinct cycles from convergence
    /// noise). Quasi-periodic and chaotic sets: their boxes overlap (with the same slack) and their
    /// largest exponents agree within max(zero band, 3 × the two convergence errors) + 10 %. Every
    /// divergent orbit is one outcome ("escape"), and so is every unresolved one.
    /// </summary>
    public bool Matches(AttractorSignature other, double tolerance, double zeroBand)
    {
        if (Regime != other.Regime || Period != other.Period)
        {
            return false;
        }

        var slack = Math.Sqrt(tolerance);
        return Regime switch
        {
            Regime.Divergent or Regime.Unresolved => true,
            Regime.FixedPoint or Regime.Periodic =>
                Close(State, other.State, slack) && Close(Box.Low, other.Box.Low, slack) && Close(Box.High, other.Box.High, slack),
            _ => Overlap(Box, other.Box, slack) && SimilarExponents(other, zeroBand),
        };
    }

    private bool SimilarExponents(AttractorSignature other, double zeroBand)
    {
        if (double.IsNaN(Exponent) || double.IsNaN(other.Exponent))
        {
            return true;
        }

        var errors = (double.IsFinite(ExponentError) ? ExponentError : 0) + (double.IsFinite(other.ExponentError) ? other.ExponentError : 0);
        var allowed = Math.Max(zeroBand, 3 * errors) + (0.1 * Math.Max(Math.Abs(Exponent), Math.Abs(other.Exponent)));
        return Math.Abs(Exponent - other.Exponent) <= allowed;
    }

    private static bool Near(double a, double b, double slack) =>
        Math.Abs(a - b) <= slack * (1 + Math.Max(Math.Abs(a), Math.Abs(b)));

    private static bool Close(double[] a, double[] b, double slack)
    {
        for (var j = 0; j < a.Length; j++)
        {
            if (!Near(a[j], b[j], slack))
            {
                return false;
            }
        }

        return true;
    }

    private static bool Overlap(StateBox a, StateBox b, double slack)
    {
        for (var j = 0; j < a.Low.Length; j++)
        {
            var scale = slack * (1 + Math.Max(Math.Max(Math.Abs(a.Low[j]), Math.Abs(a.High[j])), Math.Max(Math.Abs(b.Low[j]), Math.Abs(b.High[j]))));
            if (a.Low[j] > b.High[j] + scale || b.Low[j] > a.High[j] + scale)
            {
                return false;
            }
        }

        return true;
    }

    /// <summary>The lexicographically first state, coordinates within the slack counting as equal.</summary>
    private static double[] First(IReadOnlyList<double[]> states, double slack)
    {
        var best = states[0];
        for (var i = 1; i < states.Count; i++)
        {
            if (Before(states[i], best, slack))
            {
                best = states[i];
            }
        }

        return best;
    }

    private static bool Before(double[] a, double[] b, double slack)
    {
        for (var j = 0; j < a.Length; j++)
        {
            if (!Near(a[j], b[j], slack))
            {
                return a[j] < b[j];
            }
        }

        return false;
    }
}
