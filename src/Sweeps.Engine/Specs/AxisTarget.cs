namespace Sweeps.Engine.Specs;

/// <summary>What a grid axis sweeps: a model parameter or the initial value of a state variable.</summary>
public enum AxisTarget
{
    Parameter,
    Variable,
}
