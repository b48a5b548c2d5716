namespace Sweeps.Core.Expressions;

internal enum TokenKind
{
    Number,
    Name,
    Plus,
    Minus,
    Star,
    Slash,
    Caret,
    LeftParen,
    RightParen,
    Comma,
    End,
}
