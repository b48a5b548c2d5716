namespace Sweeps.Core.Expressions;

/// <summary>
/// Recursive-descent parser. Precedence, loosest first: <c>+ -</c>, <c>* /</c>, unary minus, <c>^</c>.
/// Power is right-associative and binds tighter than unary minus, so <c>-x^2</c> is <c>-(x^2)</c>,
/// <c>2^3^2</c> is <c>2^9</c> and <c>2^-x</c> is <c>2^(-x)</c>.
/// </summary>
public sealed class Parser
{
    private const int MaxDepth = 200;

    // Bounds the depth of every recursive pass over the tree (derivative, simplifier, printer), so no
    // input can exhaust a worker thread's stack. Real model equations are a few dozen tokens.
    private const int MaxTokens = 4000;

    private readonly List<Token> tokens;
    private readonly Scope scope;
    private int position;
    private int depth;

    private Parser(List<Token> tokens, Scope scope)
    {
        this.tokens = tokens;
        this.scope = scope;
    }

    /// <summary>Parses and resolves one expression; throws <see cref="ExpressionException"/> only.</summary>
    public static Node Parse(string text, Scope scope)
    {
        ArgumentNullException.ThrowIfNull(text);
        var tokens = Lexer.Tokenize(text);
        if (tokens.Count > MaxTokens)
        {
            throw ExpressionException.At(tokens[MaxTokens].Column, $"expression longer than {MaxTokens} tokens");
        }

        var parser = new Parser(tokens, scope);
        if (parser.Current.Kind == TokenKind.End)
        {
            throw ExpressionException.At(1, "empty expression");
        }

        var node = parser.ParseSum();
        if (parser.Current.Kind != TokenKind.End)
        {
            throw parser.Current.Kind == TokenKind.RightParen
                ? ExpressionException.At(parser.Current.Column, "unmatched ')'")
                : ExpressionException.At(parser.Current.Column, $"missing operator before {Describe(parser.Current)}");
        }

        return node;
    }

    private Token Current => tokens[position];

    private Token Advance() => tokens[position++];

    private Node ParseSum()
    {
        var left = ParseProduct();
        while (Current.Kind is TokenKind.Plus or TokenKind.Minus)
        {
            var op = Advance().Kind == TokenKind.Plus ? BinaryOperator.Add : BinaryOperator.Subtract;
            left = new BinaryNode(op, left, ParseProduct());
        }

        return left;
    }

    private Node ParseProduct()
    {
        var left = ParseUnary();
        while (Current.Kind is TokenKind.Star or TokenKind.Slash)
        {
            var op = Advance().Kind == TokenKind.Star ? BinaryOperator.Multiply : BinaryOperator.Divide;
            left = new BinaryNode(op, left, ParseUnary());
        }

        return left;
    }

    private Node ParseUnary()
    {
        Enter();
        Node result;
        if (Current.Kind == TokenKind.Minus)
        {
            Advance();
            result = new NegateNode(ParseUnary());
        }
        else if (Current.Kind == TokenKind.Plus)
        {
            Advance();
            result = ParseUnary();
        }
        else
        {
            result = ParsePower();
        }

        depth--;
        return result;
    }

    private Node ParsePower()
    {
        var basis = ParsePrimary();
        if (Current.Kind != TokenKind.Caret)
        {
            return basis;
        }

        Advance();
        return new BinaryNode(BinaryOperator.Power, basis, ParseUnary());
    }

    private Node ParsePrimary()
    {
        var token = Advance();
        switch (token.Kind)
        {
            case TokenKind.Number:
                return new NumberNode(token.Value);
            case TokenKind.Name:
                return Current.Kind == TokenKind.LeftParen ? ParseCall(token) : ResolveName(token);
            case TokenKind.LeftParen:
                var inner = ParseSum();
                Expect(TokenKind.RightParen, token);
                return inner;
            case TokenKind.End:
                throw ExpressionException.At(token.Column, "unexpected end of expression");
            default:
                throw ExpressionException.At(token.Column, $"unexpected {Describe(token)}");
        }
    }

    private Node ResolveName(Token token)
    {
        if (FunctionCatalog.TryGet(token.Text, out _))
        {
            throw ExpressionException.At(token.Column, $"'{token.Text}' is a function: call it as {token.Text}(...)");
        }

        if (token.Text == "t" && scope.Resolve("t") is null)
        {
            throw ExpressionException.At(token.Column, "unknown name 't' (the time t exists only in flows; maps count iterations)");
        }

        return scope.Resolve(token.Text)
            ?? throw ExpressionException.UnknownName(token.Column, token.Text, scope.KnownNames.Concat(FunctionCatalog.Names));
    }

    private CallNode ParseCall(Token name)
    {
        if (!FunctionCatalog.TryGet(name.Text, out var function))
        {
            throw ExpressionException.UnknownName(name.Column, name.Text, FunctionCatalog.Names);
        }

        var open = Advance();
        var arguments = new List<Node>();
        if (Current.Kind != TokenKind.RightParen)
        {
            arguments.Add(ParseSum());
            while (Current.Kind == TokenKind.Comma)
            {
                Advance();
                arguments.Add(ParseSum());
            }
        }

        Expect(TokenKind.RightParen, open);
        var arity = FunctionCatalog.Arity(function);
        if (arguments.Count != arity)
        {
            var plural = arity == 1 ? "argument" : "arguments";
            throw ExpressionException.At(name.Column, $"{name.Text} takes {arity} {plural}, got {arguments.Count}");
        }

        return new CallNode(function, arguments);
    }

    private void Expect(TokenKind kind, Token opener)
    {
        if (Current.Kind == kind)
        {
            Advance();
            return;
        }

        if (Current.Kind == TokenKind.End)
        {
            throw ExpressionException.At(opener.Column, "'(' is never closed");
        }

        throw ExpressionException.At(Current.Column, $"expected ')' but found {Describe(Current)}");
    }

    private void Enter()
    {
        if (++depth > MaxDepth)
        {
            throw ExpressionException.At(Current.Column, $"expression nested more than {MaxDepth} levels deep");
        }
    }

    private static string Describe(Token token) => token.Kind switch
    {
        TokenKind.End => "end of expression",
        TokenKind.Number => $"number '{token.Text}'",
        TokenKind.Name => $"name '{token.Text}'",
        _ => $"'{token.Text}'",
    };
}
