using Sweeps.Core.Analysis;
using Sweeps.Core.Models;

namespace Sweeps.Engine.Probing;

/// <summary>Everything a probe found at one point.</summary>
public sealed record ProbeReport(
    Model Model,
    double[] Initial,
    double[] Parameters,
    PointResult Result,
    IReadOnlyList<FixedPoint> FixedPoints,
    IReadOnlyList<string> Notes);
