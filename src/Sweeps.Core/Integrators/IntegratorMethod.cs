namespace Sweeps.Core.Integrators;

public enum IntegratorMethod
{
    Euler,
    Rk4,
    Dopri5,
}
