namespace Sweeps.Engine.Specs;

/// <summary>How flows are integrated; ignored for maps.</summary>
public sealed record IntegratorSettings(
    IntegratorMethod Method = IntegratorMethod.Dopri5,
    double Step = 0.01,
    double RelativeTolerance = 1e-9,
    double AbsoluteTolerance = 1e-12);
