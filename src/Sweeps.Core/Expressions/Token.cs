namespace Sweeps.Core.Expressions;

/// <summary>A lexical token; <see cref="Column"/> is 1-based within the expression text.</summary>
internal readonly record struct Token(TokenKind Kind, string Text, int Column, double Value = 0);
