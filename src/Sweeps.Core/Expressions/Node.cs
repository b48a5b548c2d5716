namespace Sweeps.Core.Expressions;

/// <summary>A node of a parsed, name-resolved expression. Nodes are immutable and compare by structure.</summary>
public abstract record Node
{
    /// <summary>The expression in the model language, with the fewest parentheses that keep its meaning.</summary>
    public sealed override string ToString() => ExpressionPrinter.Print(this);
}
