using CsCheck;
using Sweeps.Core.Expressions;

namespace Sweeps.Core.Tests.Expressions;

public sealed class ExpressionPropertyTests
{
    [Fact]
    public void Compile_AgreesBitForBitWithReferenceEvaluation_ForRandomExpressions()
    {
        Gen.Select(ExpressionGenerators.Tree(4), ExpressionGenerators.Point).Sample((tree, point) =>
        {
            var compiled = ExpressionCompiler.Compile([tree]);
            var result = new double[1];
            var x = new[] { point[0], point[1] };
            var p = new[] { point[2] };
            compiled(x, p, 0.25, result);
            var expected = Evaluator.Evaluate(tree, x, p, 0.25);
            return BitConverter.DoubleToInt64Bits(expected) == BitConverter.DoubleToInt64Bits(result[0])
                || (double.IsNaN(expected) && double.IsNaN(result[0]));
        }, iter: 400);
    }

    [Fact]
    public void Print_ThenParse_GivesTheSameTree_ForRandomExpressions()
    {
        ExpressionGenerators.Tree(5).Sample(tree => Parser.Parse(tree.ToString(), ExpressionGenerators.Scope).Equals(tree), iter: 1000);
    }

    [Fact]
    public void Simplify_KeepsTheValue_ForRandomExpressions()
    {
        Gen.Select(ExpressionGenerators.Tree(4), ExpressionGenerators.Point).Sample((tree, point) =>
        {
            double[] x = [point[0], point[1]];
            double[] p = [point[2]];
            var before = Evaluator.Evaluate(tree, x, p, 0.25);
            var after = Evaluator.Evaluate(Simplifier.Simplify(tree), x, p, 0.25);

            // 0*x → 0 and x − x → 0 may turn a non-finite value finite, and may drop the sign of a zero,
            // which only atan2 can tell apart among finite results; otherwise values must agree.
            return !AllFinite(tree, x, p) || SignedZeroReachesAtan2(tree, x, p)
                || Math.Abs(before - after) <= 1e-9 * (1 + Math.Abs(before));
        }, iter: 1000);
    }

    /// <summary>
    /// The symbolic derivative agrees with a five-point central difference (error O(h^4)). Points where
    /// the difference quotient itself is unstable (near a singularity or a domain edge: the estimates at
    /// h and h/2 disagree) say nothing about the derivative and are skipped, as are points where a signed
    /// zero reaches atan2 (the simplified derivative may see +0 where the function saw −0).
    /// </summary>
    [Fact]
    public void Derivative_AgreesWithCentralDifference_ForRandomSmoothExpressions()
    {
        var checkedPoints = 0;
        Gen.Select(ExpressionGenerators.Tree(3, smooth: true), ExpressionGenerators.GenericPoint).Sample((tree, point) =>
        {
            double[] x = [point[0], point[1]];
            double[] p = [point[2]];
            var f = Evaluator.Evaluate(tree, x, p, 0.25);
            var analytic = Evaluator.Evaluate(Derivative.Of(tree, ExpressionGenerators.X), x, p, 0.25);
            var coarse = FivePoint(tree, x, p, 1e-3);
            var fine = FivePoint(tree, x, p, 5e-4);
            if (!AllFinite(tree, x, p) || SignedZeroReachesAtan2(tree, x, p) || Math.Abs(analytic) > 1e4 || !double.IsFinite(coarse) || !double.IsFinite(fine) || Math.Abs(f) > 1e6
                || Math.Abs(coarse - fine) > 1e-7 * (1 + Math.Abs(fine)))
            {
                return true;
            }

            checkedPoints++;
            return Math.Abs(analytic - fine) <= 1e-6 * (1 + Math.Abs(fine));
        }, iter: 2000, threads: 1);
        Assert.True(checkedPoints > 500, $"only {checkedPoints} of 2000 cases were smooth enough to check");
    }

    [Fact]
    public void Parse_ThrowsOnlyExpressionException_ForRandomCharacters()
    {
        Gen.String[Gen.Char["xyrt0123456789.eE+-*/^(),# sinco@_\t"], 0, 40].Sample(text =>
        {
            try
            {
                Parser.Parse(text, ExpressionGenerators.Scope);
            }
            catch (ExpressionException)
            {
            }
        }, iter: 5000);
    }

    [Fact]
    public void Parse_ThrowsOnlyExpressionException_ForRandomTokenSequences()
    {
        string[] tokens = ["x", "y", "r", "t", "pi", "e", "1", "2.5", "1e-3", "+", "-", "*", "/", "^", "(", ")", ",", "sin", "atan2", "mod", "q", " "];
        Gen.Int[0, tokens.Length - 1].Array[0, 30].Sample(picks =>
        {
            var text = string.Concat(picks.Select(i => tokens[i]));
            try
            {
                var node = Parser.Parse(text, ExpressionGenerators.Scope);
                _ = Derivative.Of(node, ExpressionGenerators.X);
            }
            catch (ExpressionException)
            {
            }
        }, iter: 5000);
    }

    /// <summary>
    /// Every subexpression is finite and inside the open domain of its function, and every power with a varying exponent has a positive base
    /// (elsewhere a real power is defined only for integer exponents, and its derivative has ln of the base).
    /// </summary>
    private static bool AllFinite(Node tree, double[] x, double[] p) =>
        double.IsFinite(Evaluator.Evaluate(tree, x, p, 0.25)) && tree switch
        {
            BinaryNode { Operator: BinaryOperator.Power, Right: not NumberNode } power
                when !(Evaluator.Evaluate(power.Left, x, p, 0.25) > 0) => false,
            CallNode { Function: MathFunction.Pow } pow
                when pow.Arguments[1] is not NumberNode && !(Evaluator.Evaluate(pow.Arguments[0], x, p, 0.25) > 0) => false,
            CallNode { Function: MathFunction.Sqrt or MathFunction.Log or MathFunction.Log10 } call
                when !(Evaluator.Evaluate(call.Arguments[0], x, p, 0.25) > 0) => false,
            CallNode { Function: MathFunction.Asin or MathFunction.Acos } call
                when !(Math.Abs(Evaluator.Evaluate(call.Arguments[0], x, p, 0.25)) < 1) => false,
            NegateNode negate => AllFinite(negate.Operand, x, p),
            BinaryNode binary => AllFinite(binary.Left, x, p) && AllFinite(binary.Right, x, p),
            CallNode call => call.Arguments.All(a => AllFinite(a, x, p)),
            _ => true,
        };

    private static bool SignedZeroReachesAtan2(Node tree, double[] x, double[] p) => tree switch
    {
        CallNode { Function: MathFunction.Atan2 } call when call.Arguments.Any(a => Evaluator.Evaluate(a, x, p, 0.25) == 0) => true,
        NegateNode negate => SignedZeroReachesAtan2(negate.Operand, x, p),
        BinaryNode binary => SignedZeroReachesAtan2(binary.Left, x, p) || SignedZeroReachesAtan2(binary.Right, x, p),
        CallNode call => call.Arguments.Any(a => SignedZeroReachesAtan2(a, x, p)),
        _ => false,
    };

    private static double FivePoint(Node tree, double[] x, double[] p, double step)
    {
        var h = step * (1 + Math.Abs(x[0]));
        double At(double offset) => Evaluator.Evaluate(tree, [x[0] + offset, x[1]], p, 0.25);
        return (-At(2 * h) + (8 * At(h)) - (8 * At(-h)) + At(-2 * h)) / (12 * h);
    }
}
