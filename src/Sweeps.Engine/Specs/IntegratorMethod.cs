namespace Sweeps.Engine.Specs;

public enum IntegratorMethod
{
    Euler,
    Rk4,
    Dopri5,
}
