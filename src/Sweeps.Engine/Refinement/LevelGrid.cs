using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Refinement;

/// <summary>
/// The lattices of boundary refinement. Level ℓ halves the spacing ℓ times along every refinable axis (one
/// given by from/to/steps with at least two steps; listed values and a followed axis are not refined): such
/// an axis has (steps − 1)·2^ℓ + 1 values, and level-0 point k sits at index k·2^ℓ with bit-identical
/// coordinates (the fraction 2^ℓ·k / (2^ℓ·(steps − 1)) rounds exactly as k / (steps − 1) does).
/// </summary>
public static class LevelGrid
{
    /// <summary>Whether boundary refinement subdivides this axis.</summary>
    public static bool Refinable(Grid grid, int axis) =>
        grid.Axes[axis].Values is null && grid.Axes[axis].Steps >= 2 && grid.Follow != axis;

    /// <summary>The level-ℓ lattice of a level-0 grid.</summary>
    public static Grid At(Grid grid, int level) => level == 0
        ? grid
        : new Grid(grid.Axes.Select((axis, a) => Refinable(grid, a) ? axis with { Steps = ((axis.Steps - 1) << level) + 1 } : axis).ToArray());

    /// <summary>How many level-ℓ lattice steps one level-0 step spans along each axis (1 on axes not refined).</summary>
    public static long[] Scale(Grid grid, int level) =>
        Enumerable.Range(0, grid.Axes.Count).Select(a => Refinable(grid, a) ? 1L << level : 1L).ToArray();
}
