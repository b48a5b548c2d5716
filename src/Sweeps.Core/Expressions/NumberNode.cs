namespace Sweeps.Core.Expressions;

/// <summary>A numeric literal or a folded constant.</summary>
public sealed record NumberNode(double Value) : Node
{
    public static readonly NumberNode Zero = new(0.0);
    public static readonly NumberNode One = new(1.0);
}
