using Sweeps.Engine.Runs;
using Sweeps.Engine.Specs;

namespace Sweeps.Maps;

/// <summary>
/// The rows of a run that lie on the drawn plane (or line): axes named in the slices are fixed at the
/// grid value nearest to the one asked for; the remaining one or two axes are drawn.
/// </summary>
internal sealed record MapPlane(IReadOnlyList<GridAxis> Free, IReadOnlyList<int> Rows, IReadOnlyList<long[]> Cells, string Description)
{
    public static MapPlane Select(Grid grid, RunTable table, IReadOnlyDictionary<string, double> slices)
    {
        foreach (var name in slices.Keys.Where(n => grid.Axes.All(a => a.Name != n)))
        {
            throw new ArgumentException($"--slice {name}: '{name}' is not an axis of this run (axes: {string.Join(", ", grid.Axes.Select(a => a.Name))})");
        }

        var fixedIndex = new long[grid.Axes.Count];
        var free = new List<int>();
        var described = new List<string>();
        for (var a = 0; a < grid.Axes.Count; a++)
        {
            var axis = grid.Axes[a];
            if (slices.TryGetValue(axis.Name, out var value))
            {
                fixedIndex[a] = Nearest(axis, value);
                described.Add($"{axis.Name} = {axis.ValueAt(fixedIndex[a]):g6}");
            }
            else if (axis.Count > 1)
            {
                free.Add(a);
            }
        }

        if (free.Count is 0 or > 2)
        {
            throw new ArgumentException(free.Count == 0
                ? "nothing to draw: every axis is fixed"
                : $"the grid has {free.Count} free axes ({string.Join(", ", free.Select(a => grid.Axes[a].Name))}); choose a plane with --slice NAME=VALUE");
        }

        var rows = new List<int>();
        var cells = new List<long[]>();
        var indices = new long[grid.Axes.Count];
        for (var row = 0; row < table.Count; row++)
        {
            grid.Indices(table.Point[row], indices);
            var onPlane = true;
            for (var a = 0; a < indices.Length && onPlane; a++)
            {
                onPlane = free.Contains(a) || grid.Axes[a].Count == 1 || indices[a] == fixedIndex[a];
            }

            if (onPlane)
            {
                rows.Add(row);
                cells.Add(free.Select(a => indices[a]).ToArray());
            }
        }

        return new MapPlane(free.Select(a => grid.Axes[a]).ToArray(), rows, cells, string.Join(", ", described));
    }

    private static long Nearest(GridAxis axis, double value)
    {
        var best = 0L;
        for (var i = 1; i < axis.Count; i++)
        {
            if (Math.Abs(axis.ValueAt(i) - value) < Math.Abs(axis.ValueAt(best) - value))
            {
                best = i;
            }
        }

        return best;
    }
}
