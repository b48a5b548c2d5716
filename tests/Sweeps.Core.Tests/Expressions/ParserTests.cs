using Sweeps.Core.Expressions;

namespace Sweeps.Core.Tests.Expressions;

public sealed class ParserTests
{
    private static readonly Scope Scope = new(["x", "y"], ["r"], allowTime: true);

    private static double Eval(string text, double x = 3, double y = 5, double r = 2, double t = 0.5) =>
        Evaluator.Evaluate(Parser.Parse(text, Scope), [x, y], [r], t);

    // Precedence and associativity are the conventions of mathematical notation (common practice):
    // unary minus binds looser than ^, ^ is right-associative, * / and + - are left-associative.
    [Theory]
    [InlineData("-x^2", -9)]
    [InlineData("2^3^2", 512)]
    [InlineData("-2^2", -4)]
    [InlineData("2^-1", 0.5)]
    [InlineData("(-2)^2", 4)]
    [InlineData("10/2/5", 1)]
    [InlineData("10-2-3", 5)]
    [InlineData("1+2*3", 7)]
    [InlineData("(1+2)*3", 9)]
    [InlineData("--x", 3)]
    [InlineData("+x", 3)]
    [InlineData("1e-3*1000", 1)]
    [InlineData("2.5E+1", 25)]
    [InlineData(".5 + 5.", 5.5)]
    [InlineData("x*y - r", 13)]
    [InlineData("t*4", 2)]
    [InlineData("atan2(1, 1)*4/pi", 1)]
    [InlineData("log(e)", 1)]
    [InlineData("mod(-0.25, 1)", 0.75)]
    [InlineData("mod(7, 3)", 1)]
    [InlineData("sign(-x) + sign(0)", -1)]
    [InlineData("floor(-1.5)", -2)]
    [InlineData("min(x, y) + max(x, y)", 8)]
    [InlineData("pow(2, 10)", 1024)]
    [InlineData("abs(-x) + sqrt(16) + log10(100)", 9)]
    public void Parse_GivesConventionalMeaning_WhenEvaluated(string text, double expected)
    {
        Tolerance.Relative(expected, Eval(text), Tolerance.Rounding, text);
    }

    [Theory]
    [InlineData("r*x*(1-rr)", "col 8: unknown name 'rr' (did you mean 'r'?)")]
    [InlineData("x +", "col 4: unexpected end of expression")]
    [InlineData("", "col 1: empty expression")]
    [InlineData("2x", "col 2: missing operator after number '2'")]
    [InlineData("x y", "col 3: missing operator before name 'y'")]
    [InlineData("(x + 1", "col 1: '(' is never closed")]
    [InlineData("x + 1)", "col 6: unmatched ')'")]
    [InlineData("x ** 2", "col 3: unexpected '**' (write powers as x^2)")]
    [InlineData("sin(x, y)", "col 1: sin takes 1 argument, got 2")]
    [InlineData("atan2(x)", "col 1: atan2 takes 2 arguments, got 1")]
    [InlineData("sin + 1", "col 1: 'sin' is a function: call it as sin(...)")]
    [InlineData("sine(x)", "col 1: unknown name 'sine' (did you mean 'sin'?)")]
    [InlineData("x # 2", "col 3: unexpected character '#'")]
    [InlineData("1e", "col 2: malformed number '1e' (an exponent needs digits, as in 1e-3)")]
    [InlineData("1e999", "col 1: number '1e999' is out of range")]
    [InlineData("system(1)", "col 1: unknown name 'system'")]
    [InlineData("x, y", "col 2: missing operator before ','")]
    public void Parse_ThrowsWithColumn_WhenInputIsBad(string text, string message)
    {
        var error = Assert.Throws<ExpressionException>(() => Parser.Parse(text, Scope));
        Assert.Equal(message, error.Message);
    }

    [Fact]
    public void Parse_RejectsTime_WhenScopeHasNoTime()
    {
        var mapScope = new Scope(["x"], ["r"], allowTime: false);
        var error = Assert.Throws<ExpressionException>(() => Parser.Parse("x + t", mapScope));
        Assert.StartsWith("col 5: unknown name 't'", error.Message);
    }

    [Fact]
    public void Parse_Refuses_WhenNestingIsAbsurd()
    {
        var text = new string('(', 1000) + "x" + new string(')', 1000);
        var error = Assert.Throws<ExpressionException>(() => Parser.Parse(text, Scope));
        Assert.Contains("nested more than", error.Message);
    }
}
