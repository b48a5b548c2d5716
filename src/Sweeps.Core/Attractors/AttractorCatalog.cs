namespace Sweeps.Core.Attractors;

/// <summary>
/// Gives attractors seen across a whole grid one consistent label each — the colour of a basin picture.
/// Signatures are compared with <see cref="AttractorSignature.Matches"/> against the first one given each
/// label, in the order they are offered (point order), so the labelling is deterministic. After
/// <see cref="Capacity"/> distinct attractors every further one gets <see cref="Other"/>.
/// </summary>
public sealed class AttractorCatalog(double tolerance, double zeroBand, int capacity = AttractorCatalog.DefaultCapacity)
{
    public const int DefaultCapacity = 64;

    /// <summary>The label of attractors beyond the catalog's capacity.</summary>
    public const int Other = -1;

    private readonly List<AttractorSignature> known = [];

    public int Capacity => capacity;

    public IReadOnlyList<AttractorSignature> Known => known;

    /// <summary>Whether some attractor got <see cref="Other"/> because the catalog was full.</summary>
    public bool Overflowed { get; private set; }

    public int Label(AttractorSignature signature)
    {
        for (var i = 0; i < known.Count; i++)
        {
            if (known[i].Matches(signature, tolerance, zeroBand))
            {
                return i;
            }
        }

        if (known.Count == capacity)
        {
            Overflowed = true;
            return Other;
        }

        known.Add(signature);
        return known.Count - 1;
    }
}
