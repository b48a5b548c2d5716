using System.Linq.Expressions;
using LinqExpression = System.Linq.Expressions.Expression;

namespace Sweeps.Core.Expressions;

/// <summary>
/// Compiles nodes to straight-line delegates with System.Linq.Expressions: no interpretation, no
/// allocation per call. Small integer powers are multiplications (x^2 is x*x, an order of magnitude
/// faster than Math.Pow) — in the language's definition, so the reference evaluator does the same and
/// compiled results equal evaluated ones bit for bit.
/// </summary>
public static class ExpressionCompiler
{
    /// <summary>Compiles <paramref name="outputs"/> into one delegate that writes result[i] = outputs[i].</summary>
    public static VectorField Compile(IReadOnlyList<Node> outputs)
    {
        var x = LinqExpression.Parameter(typeof(double[]), "x");
        var p = LinqExpression.Parameter(typeof(double[]), "p");
        var t = LinqExpression.Parameter(typeof(double), "t");
        var result = LinqExpression.Parameter(typeof(double[]), "result");
        var context = new Context(x, p, t);
        var body = new List<LinqExpression>();
        for (var i = 0; i < outputs.Count; i++)
        {
            body.Add(LinqExpression.Assign(
                LinqExpression.ArrayAccess(result, LinqExpression.Constant(i)),
                context.Emit(outputs[i])));
        }

        body.Add(LinqExpression.Empty());
        var block = LinqExpression.Block(context.Temporaries, body);
        return LinqExpression.Lambda<VectorField>(block, x, p, t, result).Compile();
    }

    private sealed class Context(ParameterExpression x, ParameterExpression p, ParameterExpression t)
    {
        public List<ParameterExpression> Temporaries { get; } = [];

        public LinqExpression Emit(Node node) => node switch
        {
            NumberNode number => LinqExpression.Constant(number.Value),
            SymbolNode { Kind: SymbolKind.Variable } symbol => LinqExpression.ArrayIndex(x, LinqExpression.Constant(symbol.Index)),
            SymbolNode { Kind: SymbolKind.Parameter } symbol => LinqExpression.ArrayIndex(p, LinqExpression.Constant(symbol.Index)),
            SymbolNode => t,
            NegateNode negate => LinqExpression.Negate(Emit(negate.Operand)),
            BinaryNode { Operator: BinaryOperator.Power, Right: NumberNode exponent } power when Evaluator.IsSmallInteger(exponent.Value) =>
                IntegerPower(Emit(power.Left), (int)exponent.Value),
            BinaryNode binary => Binary(binary),
            CallNode call => LinqExpression.Call(FunctionCatalog.Method(call.Function), call.Arguments.Select(Emit)),
            _ => throw new ArgumentOutOfRangeException(nameof(node)),
        };

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
                _ => LinqExpression.Call(FunctionCatalog.Method(MathFunction.Pow), left, right),
            };
        }

        private LinqExpression IntegerPower(LinqExpression basis, int exponent)
        {
            if (exponent == 1)
            {
                return basis;
            }

            var temporary = LinqExpression.Variable(typeof(double));
            Temporaries.Add(temporary);
            var magnitude = Math.Abs(exponent);
            LinqExpression product = temporary;
            for (var i = 1; i < magnitude; i++)
            {
                product = LinqExpression.Multiply(product, temporary);
            }

            if (exponent < 0)
            {
                product = LinqExpression.Divide(LinqExpression.Constant(1.0), product);
            }

            return LinqExpression.Block(LinqExpression.Assign(temporary, basis), product);
        }
    }
}
