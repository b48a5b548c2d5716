namespace Sweeps.Core.Analysis;

/// <summary>What the flow analyzer measured, as the classifier sees it.</summary>
public sealed record FlowMeasurements(
    int Dimension,
    bool Forced,
    bool AtRest,
    int Period,
    long Crossings,
    double[] Exponents,
    double[] Errors);
