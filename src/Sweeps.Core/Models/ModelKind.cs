namespace Sweeps.Core.Models;

public enum ModelKind
{
    /// <summary>An iterated map x_{n+1} = f(x_n).</summary>
    Map,

    /// <summary>An ODE flow dx/dt = f(x, t).</summary>
    Flow,
}
