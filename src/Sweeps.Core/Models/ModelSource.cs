namespace Sweeps.Core.Models;

/// <summary>The text of a model as the user wrote it: one equation per variable, in variable order.</summary>
public sealed record ModelSource(
    ModelKind Kind,
    IReadOnlyList<string> Variables,
    IReadOnlyList<string> Parameters,
    IReadOnlyList<string> Equations,
    double? ForcingPeriod = null);
