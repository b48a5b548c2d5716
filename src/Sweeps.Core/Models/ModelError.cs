namespace Sweeps.Core.Models;

/// <summary>A problem in one equation of a model; <see cref="Column"/> is 1-based in the equation text.</summary>
public sealed record ModelError(string Variable, int Column, string Message);
