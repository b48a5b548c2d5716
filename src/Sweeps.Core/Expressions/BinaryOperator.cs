namespace Sweeps.Core.Expressions;

public enum BinaryOperator
{
    Add,
    Subtract,
    Multiply,
    Divide,
    Power,
}
