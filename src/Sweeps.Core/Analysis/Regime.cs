namespace Sweeps.Core.Analysis;

/// <summary>The attractor class of a point. Text forms (see <see cref="RegimeNames"/>) are part of the output contract.</summary>
public enum Regime
{
    FixedPoint,
    Periodic,
    QuasiPeriodic,
    Chaotic,
    Hyperchaotic,
    Divergent,
    Unresolved,
}
