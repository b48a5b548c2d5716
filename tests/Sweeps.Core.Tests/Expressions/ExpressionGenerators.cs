using CsCheck;
using Sweeps.Core.Expressions;

namespace Sweeps.Core.Tests.Expressions;

/// <summary>Random expression trees over x, y (variables), r (parameter) and t.</summary>
internal static class ExpressionGenerators
{
    public static readonly Scope Scope = new(["x", "y"], ["r"], allowTime: true);

    public static readonly SymbolNode X = new(SymbolKind.Variable, 0, "x");
    public static readonly SymbolNode Y = new(SymbolKind.Variable, 1, "y");

    private static readonly Node[] Symbols = [X, Y, new SymbolNode(SymbolKind.Parameter, 0, "r"), new SymbolNode(SymbolKind.Time, 0, "t")];

    private static readonly MathFunction[] AllFunctions = Enum.GetValues<MathFunction>();

    // Smooth on the open sets where they are finite, so finite differences apply.
    private static readonly MathFunction[] SmoothFunctions =
    [
        MathFunction.Sin, MathFunction.Cos, MathFunction.Tan, MathFunction.Asin, MathFunction.Acos, MathFunction.Atan,
        MathFunction.Atan2, MathFunction.Sinh, MathFunction.Cosh, MathFunction.Tanh, MathFunction.Exp, MathFunction.Log,
        MathFunction.Log10, MathFunction.Sqrt, MathFunction.Pow,
    ];

    /// <summary>Non-negative literals only, so that printing and re-parsing gives back the same tree.</summary>
    private static readonly Gen<Node> Leaf = Gen.OneOf(
        Gen.Int[0, 3].Select(i => Symbols[i]),
        Gen.Double[0, 4].Select(v => (Node)new NumberNode(Math.Round(v, 3))),
        Gen.Int[0, 4].Select(v => (Node)new NumberNode(v)));

    public static Gen<Node> Tree(int depth, bool smooth = false)
    {
        if (depth == 0)
        {
            return Leaf;
        }

        var sub = Tree(depth - 1, smooth);
        var functions = smooth ? SmoothFunctions : AllFunctions;
        return Gen.Frequency(
            (2, Leaf),
            (1, sub.Select(a => (Node)new NegateNode(a))),
            (4, Gen.Select(Gen.Int[0, 4], sub, sub, (op, a, b) => (Node)new BinaryNode((BinaryOperator)op, a, b))),
            (3, Gen.Select(Gen.Int[0, functions.Length - 1], sub, sub, (f, a, b) =>
                (Node)new CallNode(functions[f], FunctionCatalog.Arity(functions[f]) == 1 ? [a] : [a, b]))));
    }

    public static readonly Gen<double[]> Point = Gen.Double[-2, 2].Array[3];

    /// <summary>
    /// Points whose coordinates are not tiny (0.01 ≤ |v| ≤ 2): near 0 a quotient-rule derivative can lose
    /// all its digits to cancellation while the function itself is flat, which tests rounding, not calculus.
    /// </summary>
    public static readonly Gen<double[]> GenericPoint =
        Gen.Select(Gen.Double[0.01, 2], Gen.Bool, (v, negative) => negative ? -v : v).Array[3];
}
