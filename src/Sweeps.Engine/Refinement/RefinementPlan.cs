using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Refinement;

/// <summary>
/// Chooses the points of the next refinement level. A cell of level ℓ − 1 (the box between 2^d neighbouring
/// lattice points along the d refinable axes) whose corners are all computed but do not all agree on regime
/// and period is subdivided: every level-ℓ lattice point inside it, faces included, is added. Repeating this
/// level by level follows every boundary the coarser level saw, at half the spacing each time; a feature
/// that falls entirely between agreeing coarse points is not seen, as on any grid.
/// </summary>
public sealed class RefinementPlan
{
    private readonly Grid baseGrid;
    private readonly int finest;
    private readonly Grid finestGrid;
    private readonly Dictionary<long, (string Regime, int Period)> known = [];

    /// <param name="grid">The run's level-0 grid.</param>
    /// <param name="finest">The finest level this plan may reach; points are kept on its lattice.</param>
    public RefinementPlan(Grid grid, int finest)
    {
        baseGrid = grid;
        this.finest = finest;
        finestGrid = LevelGrid.At(grid, finest);
    }

    /// <summary>Points known so far, on any level.</summary>
    public int KnownPoints => known.Count;

    /// <summary>Records the result of a computed point of level <paramref name="level"/> (index on that level's lattice).</summary>
    public void Add(int level, long point, string regime, int period) => known[ToFinest(level, point)] = (regime, period);

    /// <summary>
    /// The new points of <paramref name="level"/> (indices on its lattice, ascending) given what is known.
    /// <paramref name="seeds"/> are the points added at level − 1 (on its lattice; for level 1 every grid
    /// point): a cell that can disagree now has one of them as a corner, so only their cells are examined.
    /// </summary>
    public long[] Next(int level, IEnumerable<long> seeds)
    {
        if (level < 1 || level > finest)
        {
            throw new ArgumentOutOfRangeException(nameof(level));
        }

        var axes = baseGrid.Axes.Count;
        var refinable = Enumerable.Range(0, axes).Where(a => LevelGrid.Refinable(baseGrid, a)).ToArray();
        var coarse = LevelGrid.At(baseGrid, level - 1);
        var fine = LevelGrid.At(baseGrid, level);
        var toFinest = LevelGrid.Scale(baseGrid, finest - (level - 1));
        var corner = new long[axes];
        var indices = new long[axes];
        var added = new HashSet<long>();
        var d = refinable.Length;
        foreach (var lower in CellCorners(coarse, refinable, seeds))
        {
            // The cell's corners, all known and not all alike?
            (string, int)? first = null;
            var mixed = false;
            var complete = true;
            for (var mask = 0; mask < 1 << d && complete; mask++)
            {
                lower.CopyTo(corner, 0);
                for (var k = 0; k < d; k++)
                {
                    corner[refinable[k]] += (mask >> k) & 1;
                }

                if (!known.TryGetValue(Key(corner, toFinest), out var value))
                {
                    complete = false;
                    break;
                }

                first ??= value;
                mixed |= value != first;
            }

            if (!complete || !mixed)
            {
                continue;
            }

            // Every level-ℓ point of the cell: offsets 0, 1, 2 along each refinable axis from twice the corner.
            var count = 1;
            for (var k = 0; k < d; k++)
            {
                count *= 3;
            }

            for (var combination = 0; combination < count; combination++)
            {
                lower.CopyTo(indices, 0);
                foreach (var a in refinable)
                {
                    indices[a] *= 2;
                }

                var rest = combination;
                for (var k = 0; k < d; k++)
                {
                    indices[refinable[k]] += rest % 3;
                    rest /= 3;
                }

                var point = fine.PointIndex(indices);
                if (!known.ContainsKey(ToFinest(level, point)))
                {
                    added.Add(point);
                }
            }
        }

        var result = added.ToArray();
        Array.Sort(result);
        return result;
    }

    /// <summary>The lower corners of the cells that have a seed as a corner, each once.</summary>
    private static IEnumerable<long[]> CellCorners(Grid lattice, int[] refinable, IEnumerable<long> seeds)
    {
        var seen = new HashSet<long>();
        var indices = new long[lattice.Axes.Count];
        var lower = new long[lattice.Axes.Count];
        var d = refinable.Length;
        foreach (var seed in seeds)
        {
            lattice.Indices(seed, indices);
            for (var mask = 0; mask < 1 << d; mask++)
            {
                indices.CopyTo(lower, 0);
                var inside = true;
                for (var k = 0; k < d && inside; k++)
                {
                    var a = refinable[k];
                    lower[a] -= (mask >> k) & 1;
                    inside = lower[a] >= 0 && lower[a] < lattice.Axes[a].Count - 1;
                }

                if (inside && seen.Add(lattice.PointIndex(lower)))
                {
                    yield return lower;
                }
            }
        }
    }

    private long ToFinest(int level, long point)
    {
        var indices = new long[baseGrid.Axes.Count];
        LevelGrid.At(baseGrid, level).Indices(point, indices);
        return Key(indices, LevelGrid.Scale(baseGrid, finest - level));
    }

    private long Key(long[] indices, long[] scale)
    {
        var scaled = new long[indices.Length];
        for (var a = 0; a < indices.Length; a++)
        {
            scaled[a] = indices[a] * scale[a];
        }

        return finestGrid.PointIndex(scaled);
    }
}
