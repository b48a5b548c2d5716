using Sweeps.Core.Analysis;

namespace Sweeps.Core.Attractors;

/// <summary>One distinct attractor (or escape) reached from the starts of a parameter point.</summary>
/// <param name="Id">0 for the one with the largest basin, then in decreasing basin order (ties: the earlier first start).</param>
/// <param name="Result">The analysis of the first start that reached it.</param>
/// <param name="Signature">What identifies it.</param>
/// <param name="Starts">How many starts reached it.</param>
/// <param name="BasinFraction">Starts reaching it over all starts; the fractions of a point sum to 1.</param>
/// <param name="FirstStart">Index of the first start that reached it.</param>
public sealed record FoundAttractor(int Id, PointResult Result, AttractorSignature Signature, int Starts, double BasinFraction, int FirstStart);
