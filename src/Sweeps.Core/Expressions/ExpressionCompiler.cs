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
        var context = new NodeEmitter(
            typeof(double),
            value => LinqExpression.Constant(value),
            symbol => symbol.Kind switch
            {
                SymbolKind.Variable => LinqExpression.ArrayIndex(x, LinqExpression.Constant(symbol.Index)),
                SymbolKind.Parameter => LinqExpression.ArrayIndex(p, LinqExpression.Constant(symbol.Index)),
                _ => t,
            },
            (method, arguments) => LinqExpression.Call(method, arguments));
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
}
