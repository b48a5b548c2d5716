namespace Sweeps.Core.Expressions;

/// <summary>
/// The names an expression may use: the model's variables and parameters, the time <c>t</c> (when
/// allowed) and the constants <c>pi</c> and <c>e</c>.
/// </summary>
public sealed class Scope
{
    /// <summary>Names that a model may not use for its own variables or parameters.</summary>
    public static readonly IReadOnlySet<string> Reserved =
        new HashSet<string>(FunctionCatalog.Names.Concat(["pi", "e", "t"]), StringComparer.Ordinal);

    private readonly Dictionary<string, SymbolNode> symbols = new(StringComparer.Ordinal);

    public Scope(IReadOnlyList<string> variables, IReadOnlyList<string> parameters, bool allowTime)
    {
        for (var i = 0; i < variables.Count; i++)
        {
            symbols[variables[i]] = new SymbolNode(SymbolKind.Variable, i, variables[i]);
        }

        for (var i = 0; i < parameters.Count; i++)
        {
            symbols[parameters[i]] = new SymbolNode(SymbolKind.Parameter, i, parameters[i]);
        }

        if (allowTime)
        {
            symbols["t"] = new SymbolNode(SymbolKind.Time, 0, "t");
        }
    }

    /// <summary>Resolves a name to a symbol or a constant; null when unknown.</summary>
    public Node? Resolve(string name) => name switch
    {
        "pi" => new NumberNode(Math.PI),
        "e" => new NumberNode(Math.E),
        _ => symbols.GetValueOrDefault(name),
    };

    /// <summary>All names a value may be written with, for suggestions.</summary>
    public IEnumerable<string> KnownNames => symbols.Keys.Concat(["pi", "e"]);
}
