namespace Sweeps.Engine.Specs;

/// <summary>
/// Fills the starting states of one point: the point's own initial state with the listed variables
/// replaced by a lattice value or a draw. The draws come from SplitMix64 (Steele, Lea and Flood, OOPSLA
/// 2014), written here rather than taken from System.Random because the seeded sequence must be the same
/// on every runtime version and machine — a point's starts may depend on the spec and its index only.
/// One per thread; the buffers are reused.
/// </summary>
public sealed class StartSource
{
    private readonly StartSpec spec;
    private readonly double[] unusedParameters = [];

    public StartSource(StartSpec spec, int dimension)
    {
        this.spec = spec;
        States = new double[spec.Count][];
        for (var k = 0; k < spec.Count; k++)
        {
            States[k] = new double[dimension];
        }
    }

    public double[][] States { get; }

    public void Fill(long point, ReadOnlySpan<double> initial)
    {
        var random = Mix(spec.Seed ^ Mix((ulong)point + 0x9E3779B97F4A7C15UL));
        for (var k = 0; k < spec.Count; k++)
        {
            var state = States[k];
            initial.CopyTo(state);
            if (spec.Lattice is { } lattice)
            {
                lattice.Apply(k, state, unusedParameters);
                continue;
            }

            foreach (var range in spec.Ranges)
            {
                random += 0x9E3779B97F4A7C15UL;
                var unit = (Mix(random) >> 11) * (1.0 / (1UL << 53));
                state[range.Slot] = range.From + ((range.To - range.From) * unit);
            }
        }
    }

    /// <summary>The SplitMix64 output function.</summary>
    private static ulong Mix(ulong z)
    {
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }
}
