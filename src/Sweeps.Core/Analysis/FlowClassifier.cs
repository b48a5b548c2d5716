using System.Globalization;

namespace Sweeps.Core.Analysis;

/// <summary>
/// Turns the measurements of a flow orbit into a regime. An orbit at rest (‖f‖ tiny) is a fixed point.
/// Section points (or stroboscopic samples of a forced flow) that repeat give a periodic orbit —
/// provided the exponents agree (an autonomous limit cycle has λ1 = 0; a stable forced response has
/// λ1 ≤ 0). Otherwise the exponents decide: two positive → hyperchaotic, one → chaotic, two zero in an
/// autonomous flow (the flow direction and one more) or one in a forced flow → quasi-periodic. A
/// one-dimensional autonomous flow can only settle or run away, so anything else there is unresolved.
/// </summary>
public static class FlowClassifier
{
    public static Verdict Decide(FlowMeasurements m, AnalysisSettings settings)
    {
        var exponents = m.Exponents;
        if (m.AtRest)
        {
            // At rest on a repelling equilibrium: only an exact start there (or rounding) keeps it, so it is no attractor.
            if (exponents.Length > 0 && exponents[0] > Math.Max(settings.ZeroBand, double.IsFinite(m.Errors[0]) ? m.Errors[0] : 0))
            {
                return new Verdict(Regime.Unresolved, $"the orbit sits exactly on an unstable equilibrium (λ1 = {Format(exponents[0])}); not an attractor");
            }

            return new Verdict(Regime.FixedPoint);
        }

        if (m.Dimension == 1 && !m.Forced)
        {
            return new Verdict(Regime.Unresolved, "a one-dimensional flow can only settle or run away, and this orbit did neither within the measured time");
        }

        var computed = exponents.Length > 0;
        var positive = 0;
        var zero = 0;

        // A bounded orbit of an autonomous flow that is not at rest has one exponent exactly zero: the
        // direction along the flow (f itself solves the variational equation). With the full spectrum,
        // the estimate nearest zero is that direction, whatever finite-time noise says.
        var along = !m.Forced && exponents.Length == m.Dimension ? NearestZero(exponents) : -1;
        for (var i = 0; i < exponents.Length; i++)
        {
            var band = Math.Max(settings.ZeroBand, double.IsFinite(m.Errors[i]) ? m.Errors[i] : 0);
            if (i == along)
            {
                zero++;
            }
            else if (exponents[i] > band)
            {
                positive++;
            }
            else if (Math.Abs(exponents[i]) <= band)
            {
                zero++;
            }
        }

        if (m.Period > 0)
        {
            if (positive > 0)
            {
                return new Verdict(Regime.Unresolved, $"section points repeat with period {m.Period} but λ1 = {Format(exponents[0])} > 0");
            }

            if (!m.Forced && computed && zero == 0)
            {
                return new Verdict(Regime.Unresolved, $"section points repeat but every exponent is negative (λ1 = {Format(exponents[0])}): a slow approach to an equilibrium?");
            }

            return new Verdict(Regime.Periodic);
        }

        if (!computed)
        {
            return new Verdict(Regime.Unresolved, $"no period up to {settings.MaxPeriod} section returns and no exponent computed");
        }

        if (positive >= 2)
        {
            return new Verdict(Regime.Hyperchaotic);
        }

        if (positive == 1)
        {
            return new Verdict(Regime.Chaotic);
        }

        var neutral = m.Forced ? 1 : 2;
        if (zero >= neutral && (m.Forced || exponents.Length >= 2))
        {
            return new Verdict(Regime.QuasiPeriodic);
        }

        if (m.Crossings == 0 && !m.Forced)
        {
            return new Verdict(Regime.Unresolved, "the orbit never crossed the section and is not at rest");
        }

        return new Verdict(Regime.Unresolved, $"no period up to {settings.MaxPeriod} {(m.Forced ? "forcing periods" : "section returns")}: a longer cycle or a transient too short");
    }

    private static int NearestZero(double[] exponents)
    {
        var best = 0;
        for (var i = 1; i < exponents.Length; i++)
        {
            if (Math.Abs(exponents[i]) < Math.Abs(exponents[best]))
            {
                best = i;
            }
        }

        return best;
    }

    private static string Format(double value) => value.ToString("g4", CultureInfo.InvariantCulture);
}
