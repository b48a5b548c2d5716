using Sweeps.Core.Analysis;
using Sweeps.Core.Models;

namespace Sweeps.Engine.Probing;

/// <summary>Everything a probe found at one point. <see cref="Result"/> is the analysis of the attractor with the largest basin.</summary>
public sealed record ProbeReport(
    Model Model,
    double[] Initial,
    double[] Parameters,
    PointResult Result,
    IReadOnlyList<FixedPoint> FixedPoints,
    IReadOnlyList<string> Notes,
    IReadOnlyList<Core.Attractors.FoundAttractor> Attractors);
