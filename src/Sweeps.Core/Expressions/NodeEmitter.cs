using System.Linq.Expressions;
using System.Reflection;
using LinqExpression = System.Linq.Expressions.Expression;

namespace Sweeps.Core.Expressions;

/// <summary>
/// Turns nodes into System.Linq.Expressions code over one value type — <see cref="double"/> for the scalar
/// delegates, a vector type for the block kernels. Both use this one emitter, so both perform the same
/// operations in the same order: small integer powers as repeated multiplication (x^2 is x*x, in the
/// language's definition), arithmetic as IEEE operators, everything else through <paramref name="call"/>.
/// </summary>
/// <param name="type">The value type of every emitted expression.</param>
/// <param name="constant">How a number becomes a value (a vector constant lives in a variable set up front).</param>
/// <param name="symbol">How a variable, parameter or the time is read.</param>
/// <param name="call">How a function of the catalog is applied to emitted arguments.</param>
/// <param name="stateFree">
/// When given, every function call (and non-integer power) that reads no variable goes through it, with the node and
/// a way to emit it: the caller may hand back a value it computed before — the same operations, so the same bits.
/// </param>
internal sealed class NodeEmitter(
    Type type,
    Func<double, LinqExpression> constant,
    Func<SymbolNode, LinqExpression> symbol,
    Func<MethodInfo, IReadOnlyList<LinqExpression>, LinqExpression> call,
    Func<Node, Func<LinqExpression>, LinqExpression>? stateFree = null)
{
    /// <summary>Block variables the emitted code needs (declare them in the enclosing block).</summary>
    public List<ParameterExpression> Temporaries { get; } = [];

    public LinqExpression Emit(Node node) =>
        stateFree is not null && IsFunction(node) && !ExpressionQueries.Mentions(node, SymbolKind.Variable)
            ? stateFree(node, () => EmitNode(node))
            : EmitNode(node);

    /// <summary>A call of the catalog: a function, or a power that is not a small integer one.</summary>
    private static bool IsFunction(Node node) =>
        node is CallNode || (node is BinaryNode { Operator: BinaryOperator.Power } && !IsSmallPower(node));

    private static bool IsSmallPower(Node node) =>
        node is BinaryNode { Operator: BinaryOperator.Power, Right: NumberNode exponent } && Evaluator.IsSmallInteger(exponent.Value);

    private LinqExpression EmitNode(Node node) => node switch
    {
        NumberNode number => constant(number.Value),
        SymbolNode symbolNode => symbol(symbolNode),
        NegateNode negate => LinqExpression.Negate(Emit(negate.Operand)),
        BinaryNode { Operator: BinaryOperator.Power, Right: NumberNode exponent } power when IsSmallPower(power) =>
            IntegerPower(Emit(power.Left), (int)exponent.Value),
        BinaryNode binary => Binary(binary),
        CallNode function => call(FunctionCatalog.Method(function.Function), function.Arguments.Select(Emit).ToArray()),
        _ => throw new ArgumentOutOfRangeException(nameof(node)),
    };

    /// <summary>A new block variable of the value type.</summary>
    public ParameterExpression Temporary()
    {
        var temporary = LinqExpression.Variable(type);
        Temporaries.Add(temporary);
        return temporary;
    }

    private LinqExpression Binary(BinaryNode binary)
    {
        var left = Emit(binary.Left);
        var right = Emit(binary.Right);
        return binary.Operator switch
        {
            BinaryOperator.Add => LinqExpression.Add(left, right),
            BinaryOperator.Subtract => LinqExpression.Subtract(left, right),
            BinaryOperator.Multiply => LinqExpression.Multiply(left, right),
            BinaryOperator.Divide => LinqExpression.Divide(left, right),
            _ => call(FunctionCatalog.Method(MathFunction.Pow), [left, right]),
        };
    }

    private LinqExpression IntegerPower(LinqExpression basis, int exponent)
    {
        if (exponent == 1)
        {
            return basis;
        }

        var temporary = Temporary();
        var magnitude = Math.Abs(exponent);
        LinqExpression product = temporary;
        for (var i = 1; i < magnitude; i++)
        {
            product = LinqExpression.Multiply(product, temporary);
        }

        if (exponent < 0)
        {
            product = LinqExpression.Divide(constant(1.0), product);
        }

        return LinqExpression.Block(LinqExpression.Assign(temporary, basis), product);
    }
}
