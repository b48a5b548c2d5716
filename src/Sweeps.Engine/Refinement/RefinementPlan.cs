using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Refinement;

/// <summary>
/// Chooses the points of the next refinement level. A cell of level ℓ − 1 (the box between 2^d neighbouring
/// lattice points along the d refinable axes) whose corners are all computed but do not all agree on regime
/// and period is subdivided: every level-ℓ lattice point inside it, faces included, is added. Repeating this
/// level by level follows every boundary the coarser level saw, at half the spacing each time; a feature
/// that falls entirely between agreeing coarse points is not seen, as on any grid.
/// The run's own points (level 0) are kept in a dense array, four bytes each — a regime's code and the period
/// in one number — so a plan of a 10^8-point run takes 400 MB, not the many gigabytes of a table of them; the
/// few points of the finer levels are kept by their index on the finest lattice.
/// </summary>
public sealed class RefinementPlan
{
    private readonly Grid baseGrid;
    private readonly int finest;
    private readonly Grid[] lattices;
    private readonly long[][] toFinest;
    private readonly bool[] refined;
    private readonly int[] run;
    private readonly Dictionary<long, int> known = [];
    private readonly List<string> regimes = [];

    /// <param name="grid">The run's level-0 grid.</param>
    /// <param name="finest">The finest level this plan may reach; points are kept on its lattice.</param>
    public RefinementPlan(Grid grid, int finest)
    {
        if (grid.PointCount > Array.MaxLength)
        {
            throw new ArgumentException($"{grid.PointCount} points are more than a refinement plan holds ({Array.MaxLength})", nameof(grid));
        }

        baseGrid = grid;
        this.finest = finest;
        lattices = Enumerable.Range(0, finest + 1).Select(level => LevelGrid.At(grid, level)).ToArray();
        toFinest = Enumerable.Range(0, finest + 1).Select(level => LevelGrid.Scale(grid, finest - level)).ToArray();
        refined = Enumerable.Range(0, grid.Axes.Count).Select(a => LevelGrid.Refinable(grid, a)).ToArray();
        run = new int[grid.PointCount];
    }

    /// <summary>Points known so far, on any level.</summary>
    public long KnownPoints { get; private set; }

    /// <summary>Records the result of a computed point of level <paramref name="level"/> (index on that level's lattice).</summary>
    public void Add(int level, long point, string regime, int period)
    {
        var value = Pack(regime, period);
        if (level == 0)
        {
            KnownPoints += run[point] == 0 ? 1 : 0;
            run[point] = value;
            return;
        }

        var indices = new long[baseGrid.Axes.Count];
        lattices[level].Indices(point, indices);
        if (RunPoint(indices, level) is { } own)
        {
            KnownPoints += run[own] == 0 ? 1 : 0;
            run[own] = value;
            return;
        }

        var key = Key(indices, level);
        KnownPoints += known.ContainsKey(key) ? 0 : 1;
        known[key] = value;
    }

    /// <summary>A regime and period as one number, never 0 (0 marks a point not known): the regime's code above 16 bits, the period (at most 4096) below.</summary>
    private int Pack(string regime, int period)
    {
        if (period is < 0 or > 0xFFFF)
        {
            throw new ArgumentOutOfRangeException(nameof(period));
        }

        var code = regimes.IndexOf(regime);
        if (code < 0)
        {
            regimes.Add(regime);
            code = regimes.Count - 1;
        }

        return ((code + 1) << 16) | period;
    }

    /// <summary>What is known of the point at <paramref name="indices"/> on level <paramref name="level"/>'s lattice (0: nothing).</summary>
    private int Known(long[] indices, int level) =>
        RunPoint(indices, level) is { } own ? run[own] : known.GetValueOrDefault(Key(indices, level));

    /// <summary>The run's own point at <paramref name="indices"/> on level <paramref name="level"/>'s lattice, if it is one (every refined index a multiple of 2^level).</summary>
    private long? RunPoint(long[] indices, int level)
    {
        var mask = (1L << level) - 1;
        Span<long> own = stackalloc long[indices.Length];
        for (var a = 0; a < indices.Length; a++)
        {
            if (!refined[a])
            {
                own[a] = indices[a];
                continue;
            }

            if ((indices[a] & mask) != 0)
            {
                return null;
            }

            own[a] = indices[a] >> level;
        }

        return baseGrid.PointIndex(own);
    }

    /// <summary>
    /// The new points of <paramref name="level"/> (indices on its lattice, ascending) given what is known.
    /// <paramref name="seeds"/> are the points added at level − 1 (on its lattice; for level 1 every grid
    /// point): a cell that can disagree now has one of them as a corner, so only their cells are examined. Null: every
    /// point of level − 1 (every cell is examined, without keeping a set of the cells seen).
    /// </summary>
    public long[] Next(int level, IEnumerable<long>? seeds)
    {
        if (level < 1 || level > finest)
        {
            throw new ArgumentOutOfRangeException(nameof(level));
        }

        var axes = baseGrid.Axes.Count;
        var refinable = Enumerable.Range(0, axes).Where(a => refined[a]).ToArray();
        var coarse = lattices[level - 1];
        var fine = lattices[level];
        var corner = new long[axes];
        var indices = new long[axes];
        var added = new HashSet<long>();
        var d = refinable.Length;
        foreach (var lower in seeds is null ? AllCellCorners(coarse, refinable) : CellCorners(coarse, refinable, seeds))
        {
            // The cell's corners, all known and not all alike?
            int? first = null;
            var mixed = false;
            var complete = true;
            for (var mask = 0; mask < 1 << d && complete; mask++)
            {
                lower.CopyTo(corner, 0);
                for (var k = 0; k < d; k++)
                {
                    corner[refinable[k]] += (mask >> k) & 1;
                }

                var value = Known(corner, level - 1);
                if (value == 0)
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

                if (Known(indices, level) == 0)
                {
                    added.Add(fine.PointIndex(indices));
                }
            }
        }

        var result = added.ToArray();
        Array.Sort(result);
        return result;
    }

    /// <summary>The lower corner of every cell of <paramref name="lattice"/> along the refinable axes, each once, in point order.</summary>
    private static IEnumerable<long[]> AllCellCorners(Grid lattice, int[] refinable)
    {
        var lower = new long[lattice.Axes.Count];
        for (var point = 0L; point < lattice.PointCount; point++)
        {
            lattice.Indices(point, lower);
            var inside = true;
            foreach (var a in refinable)
            {
                inside &= lower[a] < lattice.Axes[a].Count - 1;
            }

            if (inside)
            {
                yield return lower;
            }
        }
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

    /// <summary>The index on the finest lattice of the point at <paramref name="indices"/> on level <paramref name="level"/>'s.</summary>
    private long Key(long[] indices, int level)
    {
        Span<long> scaled = stackalloc long[indices.Length];
        for (var a = 0; a < indices.Length; a++)
        {
            scaled[a] = indices[a] * toFinest[level][a];
        }

        return lattices[finest].PointIndex(scaled);
    }
}
