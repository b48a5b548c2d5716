using System.Globalization;

namespace Sweeps.Core.Expressions;

/// <summary>Splits expression text into tokens. ASCII only: names are [A-Za-z_][A-Za-z0-9_]*.</summary>
internal static class Lexer
{
    public static List<Token> Tokenize(string text)
    {
        var tokens = new List<Token>();
        var i = 0;
        while (i < text.Length)
        {
            var c = text[i];
            var column = i + 1;
            if (c is ' ' or '\t' or '\r' or '\n')
            {
                i++;
            }
            else if (IsDigit(c) || (c == '.' && i + 1 < text.Length && IsDigit(text[i + 1])))
            {
                tokens.Add(ReadNumber(text, ref i));
            }
            else if (IsNameStart(c))
            {
                var start = i;
                while (i < text.Length && IsNamePart(text[i]))
                {
                    i++;
                }

                tokens.Add(new Token(TokenKind.Name, text[start..i], column));
            }
            else
            {
                var kind = c switch
                {
                    '+' => TokenKind.Plus,
                    '-' => TokenKind.Minus,
                    '*' => TokenKind.Star,
                    '/' => TokenKind.Slash,
                    '^' => TokenKind.Caret,
                    '(' => TokenKind.LeftParen,
                    ')' => TokenKind.RightParen,
                    ',' => TokenKind.Comma,
                    _ => throw ExpressionException.At(column, $"unexpected character {Describe(c)}"),
                };
                if (kind == TokenKind.Star && i + 1 < text.Length && text[i + 1] == '*')
                {
                    throw ExpressionException.At(column, "unexpected '**' (write powers as x^2)");
                }

                tokens.Add(new Token(kind, c.ToString(), column));
                i++;
            }
        }

        tokens.Add(new Token(TokenKind.End, "", text.Length + 1));
        return tokens;
    }

    private static Token ReadNumber(string text, ref int i)
    {
        var start = i;
        while (i < text.Length && IsDigit(text[i]))
        {
            i++;
        }

        if (i < text.Length && text[i] == '.')
        {
            i++;
            while (i < text.Length && IsDigit(text[i]))
            {
                i++;
            }
        }

        if (i < text.Length && (text[i] == 'e' || text[i] == 'E'))
        {
            var mark = i;
            i++;
            if (i < text.Length && (text[i] == '+' || text[i] == '-'))
            {
                i++;
            }

            if (i >= text.Length || !IsDigit(text[i]))
            {
                throw ExpressionException.At(mark + 1, $"malformed number '{text[start..i]}' (an exponent needs digits, as in 1e-3)");
            }

            while (i < text.Length && IsDigit(text[i]))
            {
                i++;
            }
        }

        var literal = text[start..i];
        var value = double.Parse(literal, NumberStyles.Float, CultureInfo.InvariantCulture);
        if (!double.IsFinite(value))
        {
            throw ExpressionException.At(start + 1, $"number '{literal}' is out of range");
        }

        if (i < text.Length && (IsNameStart(text[i]) || text[i] == '.'))
        {
            throw ExpressionException.At(i + 1, $"missing operator after number '{literal}'");
        }

        return new Token(TokenKind.Number, literal, start + 1, value);
    }

    private static string Describe(char c) =>
        c is >= ' ' and <= '~' ? $"'{c}'" : $"U+{(int)c:X4}";

    private static bool IsDigit(char c) => c is >= '0' and <= '9';

    private static bool IsNameStart(char c) => c is (>= 'a' and <= 'z') or (>= 'A' and <= 'Z') or '_';

    private static bool IsNamePart(char c) => IsNameStart(c) || IsDigit(c);
}
