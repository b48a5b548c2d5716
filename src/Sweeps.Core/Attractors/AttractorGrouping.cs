using Sweeps.Core.Analysis;

namespace Sweeps.Core.Attractors;

/// <summary>Deduplicates the outcomes of several starts at one parameter point into distinct attractors with basin fractions.</summary>
public static class AttractorGrouping
{
    /// <summary>
    /// Groups <paramref name="results"/> (one per start, in start order): each joins the first group whose
    /// first member it matches (<see cref="AttractorSignature.Matches"/>), else starts a new one. The order
    /// of the starts alone decides the grouping, so it is deterministic.
    /// </summary>
    public static IReadOnlyList<FoundAttractor> Group(IReadOnlyList<PointResult> results, AnalysisSettings settings)
    {
        var groups = new List<(AttractorSignature Signature, int First, int Count)>();
        for (var i = 0; i < results.Count; i++)
        {
            var signature = AttractorSignature.Of(results[i], settings.Tolerance);
            var match = groups.FindIndex(g => g.Signature.Matches(signature, settings.Tolerance, settings.ZeroBand));
            if (match < 0)
            {
                groups.Add((signature, i, 1));
            }
            else
            {
                groups[match] = groups[match] with { Count = groups[match].Count + 1 };
            }
        }

        return groups
            .OrderByDescending(g => g.Count)
            .ThenBy(g => g.First)
            .Select((g, id) => new FoundAttractor(id, results[g.First], g.Signature, g.Count, (double)g.Count / results.Count, g.First))
            .ToList();
    }

    /// <summary>The single outcome of a point analysed from one start.</summary>
    public static IReadOnlyList<FoundAttractor> Single(PointResult result, AnalysisSettings settings) =>
        [new FoundAttractor(0, result, AttractorSignature.Of(result, settings.Tolerance), 1, 1.0, 0)];
}
