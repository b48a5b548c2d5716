namespace Sweeps.Core.Analysis;

/// <summary>A regime with the reason behind it, when one is owed.</summary>
public readonly record struct Verdict(Regime Regime, string? Reason = null);
