namespace Sweeps.Core.Expressions;

/// <summary>Unary minus.</summary>
public sealed record NegateNode(Node Operand) : Node;
