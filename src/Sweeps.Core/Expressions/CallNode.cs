namespace Sweeps.Core.Expressions;

/// <summary>A call of one of the built-in functions.</summary>
public sealed record CallNode(MathFunction Function, IReadOnlyList<Node> Arguments) : Node
{
    public bool Equals(CallNode? other) =>
        other is not null && Function == other.Function && Arguments.SequenceEqual(other.Arguments);

    public override int GetHashCode()
    {
        var hash = new HashCode();
        hash.Add(Function);
        foreach (var argument in Arguments)
        {
            hash.Add(argument);
        }

        return hash.ToHashCode();
    }
}
