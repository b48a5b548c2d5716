namespace Sweeps.Core.Analysis;

/// <summary>The linear type of a fixed point (map) or equilibrium (flow), from its Jacobian's eigenvalues.</summary>
public enum FixedPointKind
{
    StableNode,
    UnstableNode,
    StableSpiral,
    UnstableSpiral,
    Saddle,
    Centre,
    NonHyperbolic,
}
