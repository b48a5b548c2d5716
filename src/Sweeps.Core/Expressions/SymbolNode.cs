namespace Sweeps.Core.Expressions;

/// <summary>A state variable, a parameter or the time <c>t</c>, resolved to its slot.</summary>
public sealed record SymbolNode(SymbolKind Kind, int Index, string Name) : Node;
