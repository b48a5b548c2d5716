namespace Sweeps.Core.Expressions;

/// <summary>
/// Symbolic partial derivatives by the rules of calculus, simplified as they are built. Piecewise
/// functions (abs, sign, floor, min, max, mod) get their derivative away from the points where they
/// jump or kink; at a tie min and max take the mean of the two one-sided derivatives.
/// </summary>
public static class Derivative
{
    private static readonly NumberNode Two = new(2.0);

    /// <summary>∂node/∂symbol.</summary>
    public static Node Of(Node node, SymbolNode symbol) => Simplifier.Simplify(D(node, symbol));

    private static Node D(Node node, SymbolNode s) => node switch
    {
        NumberNode => NumberNode.Zero,
        SymbolNode symbol => symbol.Kind == s.Kind && symbol.Index == s.Index ? NumberNode.One : NumberNode.Zero,
        NegateNode negate => Simplifier.Negate(D(negate.Operand, s)),
        BinaryNode binary => Binary(binary, s),
        CallNode call => Call(call, s),
        _ => throw new ArgumentOutOfRangeException(nameof(node)),
    };

    private static Node Binary(BinaryNode node, SymbolNode s)
    {
        var (a, b) = (node.Left, node.Right);
        var da = Simplifier.Simplify(D(a, s));
        var db = Simplifier.Simplify(D(b, s));
        return node.Operator switch
        {
            BinaryOperator.Add => Add(da, db),
            BinaryOperator.Subtract => Sub(da, db),
            BinaryOperator.Multiply => Add(Mul(da, b), Mul(a, db)),
            BinaryOperator.Divide when Simplifier.IsZero(db) => Div(da, b),
            BinaryOperator.Divide => Div(Sub(Mul(da, b), Mul(a, db)), Pow(b, Two)),
            _ => PowerRule(a, b, da, db),
        };
    }

    private static Node PowerRule(Node a, Node b, Node da, Node db)
    {
        if (Simplifier.IsZero(db))
        {
            // d(a^b) = b a^(b-1) da for an exponent that does not depend on the symbol.
            var lowered = b is NumberNode n ? new NumberNode(n.Value - 1) : Sub(b, NumberNode.One);
            return Mul(Mul(b, Pow(a, lowered)), da);
        }

        if (Simplifier.IsZero(Simplifier.Simplify(a)))
        {
            // 0^b is constant where it is differentiable (b > 0); the general rule would give 0·ln 0 = NaN.
            return NumberNode.Zero;
        }

        var power = new BinaryNode(BinaryOperator.Power, a, b);
        if (Simplifier.IsZero(da))
        {
            return Mul(Mul(power, Fn(MathFunction.Log, a)), db);
        }

        return Mul(power, Add(Mul(db, Fn(MathFunction.Log, a)), Div(Mul(b, da), a)));
    }

    private static Node Call(CallNode node, SymbolNode s)
    {
        var u = node.Arguments[0];
        var du = Simplifier.Simplify(D(u, s));
        if (node.Arguments.All(a => Simplifier.IsZero(Simplifier.Simplify(D(a, s)))))
        {
            return NumberNode.Zero;
        }

        switch (node.Function)
        {
            case MathFunction.Atan2:
                {
                    // atan2(y, x): d = (x dy − y dx) / (x² + y²)
                    var x = node.Arguments[1];
                    var dx = Simplifier.Simplify(D(x, s));
                    return Div(Sub(Mul(x, du), Mul(u, dx)), Add(Pow(x, Two), Pow(u, Two)));
                }

            case MathFunction.Min or MathFunction.Max:
                {
                    var v = node.Arguments[1];
                    var dv = Simplifier.Simplify(D(v, s));
                    var half = Mul(Fn(MathFunction.Sign, Sub(u, v)), Sub(du, dv));
                    var sum = node.Function == MathFunction.Min ? Sub(Add(du, dv), half) : Add(Add(du, dv), half);
                    return Div(sum, Two);
                }

            case MathFunction.Mod:
                {
                    // mod(a, b) = a − b floor(a/b); floor is piecewise constant.
                    var b = node.Arguments[1];
                    var db = Simplifier.Simplify(D(b, s));
                    return Sub(du, Mul(db, Fn(MathFunction.Floor, Div(u, b))));
                }

            case MathFunction.Pow:
                return PowerRule(u, node.Arguments[1], du, Simplifier.Simplify(D(node.Arguments[1], s)));
        }

        if (Simplifier.IsZero(du))
        {
            return NumberNode.Zero;
        }

        var outer = node.Function switch
        {
            MathFunction.Sin => Fn(MathFunction.Cos, u),
            MathFunction.Cos => Simplifier.Negate(Fn(MathFunction.Sin, u)),
            MathFunction.Tan => Add(NumberNode.One, Pow(node, Two)),
            MathFunction.Asin => Div(NumberNode.One, Fn(MathFunction.Sqrt, Sub(NumberNode.One, Pow(u, Two)))),
            MathFunction.Acos => Simplifier.Negate(Div(NumberNode.One, Fn(MathFunction.Sqrt, Sub(NumberNode.One, Pow(u, Two))))),
            MathFunction.Atan => Div(NumberNode.One, Add(NumberNode.One, Pow(u, Two))),
            MathFunction.Sinh => Fn(MathFunction.Cosh, u),
            MathFunction.Cosh => Fn(MathFunction.Sinh, u),
            MathFunction.Tanh => Sub(NumberNode.One, Pow(node, Two)),
            MathFunction.Exp => node,
            MathFunction.Log => Div(NumberNode.One, u),
            MathFunction.Log10 => Div(NumberNode.One, Mul(new NumberNode(Math.Log(10.0)), u)),
            MathFunction.Sqrt => Div(NumberNode.One, Mul(Two, node)),
            MathFunction.Abs => Fn(MathFunction.Sign, u),
            MathFunction.Sign or MathFunction.Floor => NumberNode.Zero,
            _ => throw new ArgumentOutOfRangeException(nameof(node)),
        };
        return Mul(outer, du);
    }

    private static Node Fn(MathFunction function, Node argument) => new CallNode(function, [argument]);

    private static Node Add(Node a, Node b) => Simplifier.Binary(BinaryOperator.Add, a, b);

    private static Node Sub(Node a, Node b) => Simplifier.Binary(BinaryOperator.Subtract, a, b);

    private static Node Mul(Node a, Node b) => Simplifier.Binary(BinaryOperator.Multiply, a, b);

    private static Node Div(Node a, Node b) => Simplifier.Binary(BinaryOperator.Divide, a, b);

    private static Node Pow(Node a, Node b) => Simplifier.Binary(BinaryOperator.Power, a, b);
}
