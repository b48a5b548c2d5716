namespace Sweeps.Core.Expressions;

/// <summary>Questions about a parsed expression.</summary>
public static class ExpressionQueries
{
    /// <summary>Whether the expression refers to any symbol of the given kind (e.g. the time t).</summary>
    public static bool Mentions(Node node, SymbolKind kind) => node switch
    {
        SymbolNode symbol => symbol.Kind == kind,
        NegateNode negate => Mentions(negate.Operand, kind),
        BinaryNode binary => Mentions(binary.Left, kind) || Mentions(binary.Right, kind),
        CallNode call => call.Arguments.Any(a => Mentions(a, kind)),
        _ => false,
    };
}
