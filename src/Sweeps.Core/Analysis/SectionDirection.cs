namespace Sweeps.Core.Analysis;

/// <summary>Which crossings of a Poincaré section count.</summary>
public enum SectionDirection
{
    Up,
    Down,
    Both,
}
