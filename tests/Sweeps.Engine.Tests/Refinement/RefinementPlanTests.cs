using CsCheck;
using Sweeps.Engine.Refinement;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Tests.Refinement;

/// <summary>
/// The refinement plan against its rule computed the plain way: every cell of level ℓ − 1 examined, every point kept in
/// one table by its coordinates on the finest lattice. The plan keeps the run's own points in a dense array and examines
/// only the cells at the previous level's new points; both must choose the same points at every level.
/// </summary>
public sealed class RefinementPlanTests
{
    private static readonly string[] Regimes = ["fixed-point", "periodic", "chaotic"];

    // Grids of one to three axes: from/to/steps axes (refined) and listed values (never refined).
    private static readonly Gen<(int Count, bool Listed)[]> Shapes =
        Gen.Select(Gen.Int[1, 5], Gen.Bool, (count, listed) => (count, listed && count > 1)).Array[1, 3];

    [Fact]
    public void Next_ChoosesThePointsOfTheRule_AtEveryLevel()
    {
        Gen.Select(Shapes, Gen.Int[1, 3], Gen.Int[0, 1000]).Sample((shape, levels, seed) =>
        {
            var grid = new Grid(shape.Select((s, a) => s.Listed
                ? new GridAxis($"v{a}", AxisTarget.Parameter, a, 0, 0, 0, Values: Enumerable.Range(0, s.Count).Select(i => (double)i).ToArray())
                : new GridAxis($"p{a}", AxisTarget.Parameter, a, 0, 1, s.Count)).ToArray());
            var plan = new RefinementPlan(grid, levels);
            var reference = new Reference(grid, levels);
            for (var point = 0L; point < grid.PointCount; point++)
            {
                var (regime, period) = Result(reference.Finest(0, point), seed);
                plan.Add(0, point, regime, period);
                reference.Add(0, point, (regime, period));
            }

            IEnumerable<long>? seeds = null;
            for (var level = 1; level <= levels; level++)
            {
                var points = plan.Next(level, seeds);
                Assert.Equal(reference.Next(level), points);
                foreach (var point in points)
                {
                    var result = Result(reference.Finest(level, point), seed);
                    plan.Add(level, point, result.Regime, result.Period);
                    reference.Add(level, point, result);
                }

                Assert.Equal(reference.Known, plan.KnownPoints);
                seeds = points;
            }
        });
    }

    [Fact]
    public void Next_RefinesTheCellsWhoseCornersDisagree()
    {
        // Five points along one axis, a boundary between the third and fourth: level 1 adds the midpoint of that cell
        // alone (index 5 of the nine level-1 points). Found chaotic, it agrees with the fourth point, so level 2 adds
        // only the midpoint of the half that still disagrees (index 9 of seventeen).
        var grid = new Grid([new GridAxis("r", AxisTarget.Parameter, 0, 0, 1, 5)]);
        var plan = new RefinementPlan(grid, 2);
        for (var point = 0L; point < 5; point++)
        {
            plan.Add(0, point, point < 3 ? "periodic" : "chaotic", point < 3 ? 2 : 0);
        }

        Assert.Equal([5L], plan.Next(1, null));
        plan.Add(1, 5, "chaotic", 0);
        Assert.Equal([9L], plan.Next(2, [5L]));
        Assert.Equal(6L, plan.KnownPoints);
    }

    /// <summary>A point's result from its place on the finest lattice: few classes, so that neighbours often differ.</summary>
    private static (string Regime, int Period) Result(long finest, int seed)
    {
        var hash = (uint)HashCode.Combine(finest, seed);
        return (Regimes[hash % 3], (int)(hash / 3 % 2));
    }

    /// <summary>The rule of <see cref="RefinementPlan"/> as its summary states it, every cell examined.</summary>
    private sealed class Reference(Grid grid, int finest)
    {
        private readonly Dictionary<long, (string, int)> known = [];

        public long Known => known.Count;

        public long Finest(int level, long point)
        {
            var indices = new long[grid.Axes.Count];
            LevelGrid.At(grid, level).Indices(point, indices);
            var scale = LevelGrid.Scale(grid, finest - level);
            for (var a = 0; a < indices.Length; a++)
            {
                indices[a] *= scale[a];
            }

            return LevelGrid.At(grid, finest).PointIndex(indices);
        }

        public void Add(int level, long point, (string, int) result) => known[Finest(level, point)] = result;

        public long[] Next(int level)
        {
            var coarse = LevelGrid.At(grid, level - 1);
            var fine = LevelGrid.At(grid, level);
            var refinable = Enumerable.Range(0, grid.Axes.Count).Where(a => LevelGrid.Refinable(grid, a)).ToArray();
            var added = new SortedSet<long>();
            var lower = new long[grid.Axes.Count];
            for (var point = 0L; point < coarse.PointCount; point++)
            {
                coarse.Indices(point, lower);
                if (refinable.Any(a => lower[a] == coarse.Axes[a].Count - 1))
                {
                    continue;
                }

                // The cell's 2^d corners: all known and not all alike?
                var corners = Enumerable.Range(0, 1 << refinable.Length).Select(mask =>
                {
                    var corner = (long[])lower.Clone();
                    for (var k = 0; k < refinable.Length; k++)
                    {
                        corner[refinable[k]] += (mask >> k) & 1;
                    }

                    return known.TryGetValue(Finest(level - 1, coarse.PointIndex(corner)), out var value) ? value : ((string, int)?)null;
                }).ToList();
                if (corners.Any(c => c is null) || corners.Distinct().Count() == 1)
                {
                    continue;
                }

                // Every level-ℓ point of the cell: 2·lower + 0, 1 or 2 along each refinable axis.
                foreach (var offsets in Offsets(refinable.Length))
                {
                    var indices = (long[])lower.Clone();
                    foreach (var a in refinable)
                    {
                        indices[a] *= 2;
                    }

                    for (var k = 0; k < refinable.Length; k++)
                    {
                        indices[refinable[k]] += offsets[k];
                    }

                    var candidate = fine.PointIndex(indices);
                    if (!known.ContainsKey(Finest(level, candidate)))
                    {
                        added.Add(candidate);
                    }
                }
            }

            return [.. added];
        }

        private static IEnumerable<int[]> Offsets(int d) =>
            d == 0 ? [[]] : Offsets(d - 1).SelectMany(rest => new[] { 0, 1, 2 }.Select(o => rest.Append(o).ToArray()));
    }
}
