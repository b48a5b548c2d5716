using System.Globalization;

namespace Sweeps.Core.Analysis;

/// <summary>
/// Turns the measurements of a map orbit into a regime. The period detector decides first: a cycle
/// found at the end of the orbit is a fixed point or a periodic orbit — unless it is unstable, which
/// happens only when rounding has put the orbit exactly on a repelling cycle (a tent- or doubling-type
/// map collapsing onto 0 in binary). Without a cycle, the exponents decide, each compared with a zero
/// band that is never narrower than its own convergence error. Where neither is conclusive the point
/// is unresolved with the reason: a wrong label is worse than none.
/// </summary>
public static class MapClassifier
{
    private const double UnstableMargin = 1e-6;

    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public static Verdict Decide(int period, double multiplier, double[] exponents, double[] errors, AnalysisSettings settings)
    {
        if (period > 0)
        {
            if (multiplier > 1 + UnstableMargin)
            {
                var what = period == 1 ? "an unstable fixed point" : $"an unstable period-{period} cycle";
                return new Verdict(
                    Regime.Unresolved,
                    $"orbit landed exactly on {what} (multiplier {Format(multiplier)}): floating-point collapse, not an attractor");
            }

            return new Verdict(period == 1 ? Regime.FixedPoint : Regime.Periodic);
        }

        if (exponents.Length == 0)
        {
            return new Verdict(Regime.Unresolved, $"no period up to {settings.MaxPeriod} and no exponent computed");
        }

        var positive = 0;
        for (var i = 0; i < exponents.Length; i++)
        {
            if (exponents[i] > Band(errors[i], settings))
            {
                positive++;
            }
        }

        if (positive >= 2)
        {
            return new Verdict(Regime.Hyperchaotic);
        }

        if (positive == 1)
        {
            return new Verdict(Regime.Chaotic);
        }

        var largest = exponents[0];
        var band = Band(errors[0], settings);
        if (Math.Abs(largest) <= band)
        {
            return new Verdict(Regime.QuasiPeriodic);
        }

        return new Verdict(
            Regime.Unresolved,
            $"largest exponent {Format(largest)} < 0 but no period up to {settings.MaxPeriod}: a longer cycle or a transient too short");
    }

    private static double Band(double error, AnalysisSettings settings) =>
        Math.Max(settings.ZeroBand, double.IsFinite(error) ? error : 0);

    private static string Format(double value) => value.ToString("g4", CultureInfo.InvariantCulture);
}
