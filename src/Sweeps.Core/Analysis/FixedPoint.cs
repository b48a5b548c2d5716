using System.Numerics;

namespace Sweeps.Core.Analysis;

/// <summary>A fixed point of a map (or an equilibrium of a flow) with the eigenvalues of the Jacobian there.</summary>
public sealed record FixedPoint(double[] State, Complex[] Eigenvalues, FixedPointKind Kind)
{
    /// <summary>Whether small perturbations die out.</summary>
    public bool IsStable => Kind is FixedPointKind.StableNode or FixedPointKind.StableSpiral;
}
