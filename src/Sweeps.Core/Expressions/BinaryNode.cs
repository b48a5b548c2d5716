namespace Sweeps.Core.Expressions;

/// <summary>An arithmetic operation on two operands.</summary>
public sealed record BinaryNode(BinaryOperator Operator, Node Left, Node Right) : Node;
