namespace Sweeps.Core.Expressions;

/// <summary>
/// Basic algebraic simplification: constant folding (only when the result is finite), the
/// identities of 0 and 1, double negation and sign pulling. Used on symbolic derivatives so that the
/// compiled Jacobian does no needless work. Like every computer-algebra system it treats 0*x as 0,
/// which differs from IEEE arithmetic only when x is infinite or NaN.
/// </summary>
public static class Simplifier
{
    public static Node Simplify(Node node) => node switch
    {
        NegateNode negate => Negate(Simplify(negate.Operand)),
        BinaryNode binary => Binary(binary.Operator, Simplify(binary.Left), Simplify(binary.Right)),
        CallNode call => Call(call.Function, call.Arguments.Select(Simplify).ToArray()),
        _ => node,
    };

    internal static Node Negate(Node operand) => operand switch
    {
        NumberNode number => new NumberNode(-number.Value),
        NegateNode inner => inner.Operand,
        _ => new NegateNode(operand),
    };

    internal static Node Binary(BinaryOperator op, Node left, Node right)
    {
        if (left is NumberNode a && right is NumberNode b)
        {
            var folded = Evaluator.Apply(op, a.Value, b.Value);
            if (double.IsFinite(folded))
            {
                return new NumberNode(folded);
            }
        }

        return op switch
        {
            BinaryOperator.Add => Add(left, right),
            BinaryOperator.Subtract => Subtract(left, right),
            BinaryOperator.Multiply => Multiply(left, right),
            BinaryOperator.Divide => Divide(left, right),
            _ => Power(left, right),
        };
    }

    private static Node Add(Node left, Node right)
    {
        if (IsZero(left))
        {
            return right;
        }

        if (IsZero(right))
        {
            return left;
        }

        if (right is NegateNode negated)
        {
            return Subtract(left, negated.Operand);
        }

        return new BinaryNode(BinaryOperator.Add, left, right);
    }

    private static Node Subtract(Node left, Node right)
    {
        if (IsZero(right))
        {
            return left;
        }

        if (IsZero(left))
        {
            return Negate(right);
        }

        if (left.Equals(right))
        {
            return NumberNode.Zero;
        }

        if (right is NegateNode negated)
        {
            return Add(left, negated.Operand);
        }

        return new BinaryNode(BinaryOperator.Subtract, left, right);
    }

    private static Node Multiply(Node left, Node right)
    {
        if (IsZero(left) || IsZero(right))
        {
            return NumberNode.Zero;
        }

        if (IsNumber(left, 1))
        {
            return right;
        }

        if (IsNumber(right, 1))
        {
            return left;
        }

        if (IsNumber(left, -1))
        {
            return Negate(right);
        }

        if (IsNumber(right, -1))
        {
            return Negate(left);
        }

        if (left is NegateNode leftNegated)
        {
            return Negate(Multiply(leftNegated.Operand, right));
        }

        if (right is NegateNode rightNegated)
        {
            return Negate(Multiply(left, rightNegated.Operand));
        }

        if (right is NumberNode && left is not NumberNode)
        {
            (left, right) = (right, left);
        }

        if (left is NumberNode outer && right is BinaryNode { Operator: BinaryOperator.Multiply, Left: NumberNode inner } product)
        {
            var folded = outer.Value * inner.Value;
            if (double.IsFinite(folded))
            {
                return Multiply(new NumberNode(folded), product.Right);
            }
        }

        return new BinaryNode(BinaryOperator.Multiply, left, right);
    }

    private static Node Divide(Node left, Node right)
    {
        if (IsNumber(right, 1))
        {
            return left;
        }

        if (IsNumber(right, -1))
        {
            return Negate(left);
        }

        if (IsZero(left) && !IsZero(right))
        {
            return NumberNode.Zero;
        }

        if (left is NegateNode leftNegated)
        {
            return Negate(Divide(leftNegated.Operand, right));
        }

        return new BinaryNode(BinaryOperator.Divide, left, right);
    }

    private static Node Power(Node left, Node right)
    {
        if (IsZero(right) || IsNumber(left, 1))
        {
            return NumberNode.One;
        }

        if (IsNumber(right, 1))
        {
            return left;
        }

        return new BinaryNode(BinaryOperator.Power, left, right);
    }

    private static Node Call(MathFunction function, Node[] arguments)
    {
        if (arguments.All(a => a is NumberNode))
        {
            var first = ((NumberNode)arguments[0]).Value;
            var second = arguments.Length > 1 ? ((NumberNode)arguments[1]).Value : double.NaN;
            var folded = FunctionCatalog.Apply(function, first, second);
            if (double.IsFinite(folded))
            {
                return new NumberNode(folded);
            }
        }

        return new CallNode(function, arguments);
    }

    internal static bool IsZero(Node node) => node is NumberNode { Value: 0.0 };

    private static bool IsNumber(Node node, double value) => node is NumberNode number && number.Value == value;
}
