using Sweeps.Engine.Refinement;
using Sweeps.Engine.Runs;
using Sweeps.Engine.Specs;

namespace Sweeps.Maps;

/// <summary>
/// The rows of a run that lie on the drawn plane (or line): axes named in the slices are fixed at the
/// grid value nearest to the one asked for; the remaining one or two axes are drawn.
/// </summary>
/// <param name="Free">The drawn axes (for a refined plane: on the finest lattice).</param>
/// <param name="Rows">The table rows on the plane.</param>
/// <param name="Cells">Each row's index along each drawn axis.</param>
/// <param name="Description">The fixed axes, as text.</param>
/// <param name="Half">For a refined plane, each row's half-width in cells along each drawn axis (a coarser point
/// covers the cells around it up to halfway to its neighbours); null when every row is one cell.</param>
internal sealed record MapPlane(IReadOnlyList<GridAxis> Free, IReadOnlyList<int> Rows, CellIndices Cells, string Description, IReadOnlyList<long[]>? Half = null)
{
    /// <summary>
    /// The plane of a run and its refinement levels together, on the finest level's lattice: tables[ℓ] holds
    /// level ℓ's rows (0 = the run itself); the merged table's rows are the tables' rows in order. A level-ℓ
    /// point sits at its index × 2^(L − ℓ) along refined axes and covers ±2^(L − ℓ − 1) cells there.
    /// </summary>
    public static (MapPlane Plane, RunTable Merged) SelectRefined(Grid grid, IReadOnlyList<RunTable> tables, IReadOnlyDictionary<string, double> slices)
    {
        var finest = tables.Count - 1;
        var exact = ExactSlices(grid, slices);
        var coarse = Select(grid, tables[0], slices);
        var rows = new List<int>();
        var cells = new CellIndices(coarse.Free.Count);
        var halves = new List<long[]>();
        var cell = new long[coarse.Free.Count];
        var offset = 0;
        for (var level = 0; level <= finest; level++)
        {
            var plane = SelectLevel(grid, level, finest, tables[level], exact);
            for (var k = 0; k < plane.Rows.Count; k++)
            {
                rows.Add(offset + plane.Rows[k]);
                for (var a = 0; a < cell.Length; a++)
                {
                    cell[a] = plane.Cells[k, a];
                }

                cells.Add(cell);
                halves.Add(plane.Half![k]);
            }

            offset += tables[level].Count;
        }

        return (new MapPlane(FinestAxes(grid, finest, coarse.Free), rows, cells, coarse.Description, halves), RunTable.Merge(tables));
    }

    /// <summary>
    /// Slices at the exact level-0 values (the grid value nearest to each one asked for), which every finer lattice holds
    /// bit for bit.
    /// </summary>
    public static IReadOnlyDictionary<string, double> ExactSlices(Grid grid, IReadOnlyDictionary<string, double> slices) =>
        slices.Keys.ToDictionary(name => name, name =>
        {
            var axis = grid.Axes.FirstOrDefault(a => a.Name == name);
            return axis is null ? slices[name] : axis.ValueAt(Nearest(axis, slices[name]));
        });

    /// <summary>
    /// The plane of one table of level <paramref name="level"/> (its rows in its own order) on the lattice of level
    /// <paramref name="finest"/>, each row with its half-width: what <see cref="SelectRefined"/> draws of that table, for
    /// a reader that takes a refined run one part at a time. <paramref name="exact"/>: <see cref="ExactSlices"/>.
    /// </summary>
    public static MapPlane SelectLevel(Grid grid, int level, int finest, RunTable table, IReadOnlyDictionary<string, double> exact)
    {
        var plane = Select(LevelGrid.At(grid, level), table, exact);
        var stretch = 1L << (finest - level);
        var free = plane.Free.Select(f => LevelGrid.Refinable(grid, IndexOf(grid, f.Name))).ToArray();
        var half = free.Select(refined => refined ? stretch / 2 : 0L).ToArray();
        var cells = new CellIndices(free.Length, plane.Rows.Count);
        var cell = new long[free.Length];
        var halves = new long[plane.Rows.Count][];
        for (var k = 0; k < plane.Rows.Count; k++)
        {
            for (var a = 0; a < cell.Length; a++)
            {
                cell[a] = free[a] ? plane.Cells[k, a] * stretch : plane.Cells[k, a];
            }

            cells.Add(cell);
            halves[k] = half; // one level's rows share their half-widths
        }

        return new MapPlane(FinestAxes(grid, finest, plane.Free), plane.Rows, cells, plane.Description, halves);
    }

    /// <summary>The drawn axes on the finest level's lattice.</summary>
    private static GridAxis[] FinestAxes(Grid grid, int finest, IReadOnlyList<GridAxis> free)
    {
        var finestGrid = LevelGrid.At(grid, finest);
        return free.Select(f => finestGrid.Axes[IndexOf(grid, f.Name)]).ToArray();
    }

    private static int IndexOf(Grid grid, string name) => grid.Axes.ToList().FindIndex(a => a.Name == name);

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

        var rows = new List<int>(table.Count);
        var cells = new CellIndices(free.Count, table.Count);
        var cell = new long[free.Count];
        var indices = new long[grid.Axes.Count];
        var drawn = Enumerable.Range(0, grid.Axes.Count).Select(a => free.Contains(a) || grid.Axes[a].Count == 1).ToArray();
        for (var row = 0; row < table.Count; row++)
        {
            grid.Indices(table.Point[row], indices);
            var onPlane = true;
            for (var a = 0; a < indices.Length && onPlane; a++)
            {
                onPlane = drawn[a] || indices[a] == fixedIndex[a];
            }

            if (onPlane)
            {
                rows.Add(row);
                for (var f = 0; f < cell.Length; f++)
                {
                    cell[f] = indices[free[f]];
                }

                cells.Add(cell);
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

/// <summary>Each row's index along each drawn axis, kept flat (row k, axis a at k · axes + a): one array for all rows.</summary>
internal sealed class CellIndices(int axes, int capacity = 16)
{
    private long[] values = new long[Math.Max(1, capacity) * Math.Max(1, axes)];

    public int Axes { get; } = axes;

    public int Count { get; private set; }

    public long this[int row, int axis] => values[(row * Axes) + axis];

    public void Add(ReadOnlySpan<long> cell)
    {
        if ((Count + 1) * Axes > values.Length)
        {
            Array.Resize(ref values, 2 * values.Length);
        }

        cell[..Axes].CopyTo(values.AsSpan(Count * Axes));
        Count++;
    }
}
