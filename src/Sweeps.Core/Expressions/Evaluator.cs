namespace Sweeps.Core.Expressions;

/// <summary>
/// Reference evaluation by walking the tree. Slow and simple on purpose: it is the yardstick the
/// compiled code is tested against, and it serves one-off evaluations outside hot loops.
/// </summary>
public static class Evaluator
{
    public static double Evaluate(Node node, ReadOnlySpan<double> variables, ReadOnlySpan<double> parameters, double time) =>
        node switch
        {
            NumberNode number => number.Value,
            SymbolNode { Kind: SymbolKind.Variable } symbol => variables[symbol.Index],
            SymbolNode { Kind: SymbolKind.Parameter } symbol => parameters[symbol.Index],
            SymbolNode => time,
            NegateNode negate => -Evaluate(negate.Operand, variables, parameters, time),
            BinaryNode { Operator: BinaryOperator.Power, Right: NumberNode exponent } power when IsSmallInteger(exponent.Value) =>
                IntegerPower(Evaluate(power.Left, variables, parameters, time), (int)exponent.Value),
            BinaryNode binary => Apply(
                binary.Operator,
                Evaluate(binary.Left, variables, parameters, time),
                Evaluate(binary.Right, variables, parameters, time)),
            CallNode call => FunctionCatalog.Apply(
                call.Function,
                Evaluate(call.Arguments[0], variables, parameters, time),
                call.Arguments.Count > 1 ? Evaluate(call.Arguments[1], variables, parameters, time) : double.NaN),
            _ => throw new ArgumentOutOfRangeException(nameof(node)),
        };

    internal static double Apply(BinaryOperator op, double a, double b) => op switch
    {
        BinaryOperator.Add => a + b,
        BinaryOperator.Subtract => a - b,
        BinaryOperator.Multiply => a * b,
        BinaryOperator.Divide => a / b,
        _ => Math.Pow(a, b),
    };

    /// <summary>Exponents the language evaluates by repeated multiplication (x^2 is x*x), as the compiler does.</summary>
    internal static bool IsSmallInteger(double exponent) =>
        exponent == Math.Floor(exponent) && Math.Abs(exponent) is >= 1 and <= 4;

    /// <summary>x^n for 1 ≤ |n| ≤ 4 as ((x*x)*x)*x, then 1/… for negative n: the same operations, in the same order, as compiled code.</summary>
    internal static double IntegerPower(double x, int exponent)
    {
        var product = x;
        for (var i = 1; i < Math.Abs(exponent); i++)
        {
            product *= x;
        }

        return exponent < 0 ? 1.0 / product : product;
    }
}
