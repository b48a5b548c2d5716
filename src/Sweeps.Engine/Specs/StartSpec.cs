namespace Sweeps.Engine.Specs;

/// <summary>
/// Several starting states per parameter point ([analysis] starts with a [starts] box). Either a lattice —
/// every listed variable has steps, and the starts are the product of those axes, the same for every
/// point — or <see cref="Count"/> draws, uniform in each listed range, from a generator seeded by
/// <see cref="Seed"/> and the point index only. Variables not listed keep the point's own initial value.
/// </summary>
/// <param name="Count">Starts per point.</param>
/// <param name="Ranges">One range per listed variable, in the order written.</param>
/// <param name="Lattice">The lattice, when the starts are one (its axes target variables).</param>
/// <param name="Seed">Seed of the random draws (with the point index).</param>
public sealed record StartSpec(int Count, IReadOnlyList<StartRange> Ranges, Grid? Lattice, ulong Seed)
{
    /// <summary>Most starts per point Sweeps accepts.</summary>
    public const int MaxCount = 4096;
}

/// <summary>The range a variable's starting value is drawn from.</summary>
public sealed record StartRange(string Variable, int Slot, double From, double To);
