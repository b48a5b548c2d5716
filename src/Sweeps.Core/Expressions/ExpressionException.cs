namespace Sweeps.Core.Expressions;

/// <summary>
/// The one error type of the model language: a message and the 1-based column in the expression
/// text where the problem is. Nothing else escapes the parser.
/// </summary>
public sealed class ExpressionException : Exception
{
    private ExpressionException(int column, string problem)
        : base($"col {column}: {problem}")
    {
        Column = column;
        Problem = problem;
    }

    /// <summary>1-based column in the expression text.</summary>
    public int Column { get; }

    /// <summary>The problem without the column prefix.</summary>
    public string Problem { get; }

    internal static ExpressionException At(int column, string problem) => new(column, problem);

    internal static ExpressionException UnknownName(int column, string name, IEnumerable<string> known)
    {
        var suggestion = NameSuggester.Closest(name, known);
        var hint = suggestion is null ? "" : $" (did you mean '{suggestion}'?)";
        return new(column, $"unknown name '{name}'{hint}");
    }
}
