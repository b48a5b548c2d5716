namespace Sweeps.Core.Expressions;

/// <summary>What a name in an expression refers to.</summary>
public enum SymbolKind
{
    Variable,
    Parameter,
    Time,
}
