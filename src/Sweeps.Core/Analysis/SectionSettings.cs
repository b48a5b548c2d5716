namespace Sweeps.Core.Analysis;

/// <summary>
/// A Poincaré section of an autonomous flow: the plane x[Variable] = Level, crossed in
/// <see cref="Direction"/>. Without a level, the section sits at the mean of that variable over the
/// second half of the transient, which every bounded oscillation crosses.
/// </summary>
public sealed record SectionSettings(int Variable = 0, double? Level = null, SectionDirection Direction = SectionDirection.Up);
