namespace Sweeps.Maps;

public enum ColorMode
{
    Regime,
    Period,
    Lyapunov,
}
