using System.Numerics;
using Sweeps.Core.Models;

namespace Sweeps.Core.Analysis;

/// <summary>
/// Classifies a fixed point by the eigenvalues μ of the Jacobian (common practice of linear stability
/// analysis). Maps: |μ| &lt; 1 contracts, |μ| &gt; 1 expands. Flows: Re μ &lt; 0 contracts, Re μ &gt; 0 expands.
/// Any eigenvalue on the boundary (within <see cref="Margin"/>) makes the point non-hyperbolic, where
/// linearisation decides nothing — except a flow's purely imaginary pair with no other neutral
/// direction, reported as centre-like.
/// </summary>
public static class FixedPointClassifier
{
    public const double Margin = 1e-9;

    public static FixedPointKind Classify(Complex[] eigenvalues, ModelKind kind)
    {
        var contracting = 0;
        var expanding = 0;
        var neutral = 0;
        var rotating = false;
        foreach (var mu in eigenvalues)
        {
            var growth = kind == ModelKind.Map ? mu.Magnitude - 1 : mu.Real;
            if (Math.Abs(growth) <= Margin)
            {
                neutral++;
            }
            else if (growth < 0)
            {
                contracting++;
            }
            else
            {
                expanding++;
            }

            rotating |= Math.Abs(mu.Imaginary) > Margin;
        }

        if (neutral > 0)
        {
            var centre = kind == ModelKind.Flow && expanding == 0 && contracting == 0 && rotating;
            return centre ? FixedPointKind.Centre : FixedPointKind.NonHyperbolic;
        }

        if (expanding > 0 && contracting > 0)
        {
            return FixedPointKind.Saddle;
        }

        return (expanding > 0, rotating) switch
        {
            (false, false) => FixedPointKind.StableNode,
            (false, true) => FixedPointKind.StableSpiral,
            (true, false) => FixedPointKind.UnstableNode,
            (true, true) => FixedPointKind.UnstableSpiral,
        };
    }

    /// <summary>Text used in reports: "stable node", "saddle", …; flows say "focus" where maps say "spiral".</summary>
    public static string Describe(FixedPointKind kind, ModelKind model) => kind switch
    {
        FixedPointKind.StableNode => "stable node",
        FixedPointKind.UnstableNode => "unstable node",
        FixedPointKind.StableSpiral => model == ModelKind.Map ? "stable spiral" : "stable focus",
        FixedPointKind.UnstableSpiral => model == ModelKind.Map ? "unstable spiral" : "unstable focus",
        FixedPointKind.Saddle => "saddle",
        FixedPointKind.Centre => "centre-like",
        _ => "non-hyperbolic",
    };
}
