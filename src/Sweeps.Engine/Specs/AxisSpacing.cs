namespace Sweeps.Engine.Specs;

public enum AxisSpacing
{
    Linear,
    Log,
}
