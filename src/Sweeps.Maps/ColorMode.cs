namespace Sweeps.Maps;

public enum ColorMode
{
    Regime,
    Period,
    Lyapunov,

    /// <summary>The grid-wide identity of each point's attractor (its largest basin): a basin picture on initial-condition axes.</summary>
    Attractor,
}
