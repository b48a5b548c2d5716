namespace Sweeps.Core.Analysis;

/// <summary>
/// How one point is analysed. For maps, <see cref="Transient"/> and <see cref="Measure"/> count
/// iterations. <see cref="Tolerance"/> is used both as absolute and relative tolerance of the period
/// test: |a − b| ≤ tol·(1 + max(|a|, |b|)).
/// </summary>
/// <param name="Transient">Iterations discarded before measuring.</param>
/// <param name="Measure">Iterations over which exponents are averaged; the last 2·MaxPeriod of them feed the period test.</param>
/// <param name="Lyapunov">Which exponents to compute.</param>
/// <param name="MaxPeriod">Longest cycle the period detector looks for.</param>
/// <param name="Tolerance">Period-test tolerance (absolute and relative).</param>
/// <param name="Escape">A state component beyond ±Escape counts as divergence.</param>
/// <param name="ZeroBand">An exponent within ±max(ZeroBand, its convergence error) counts as zero.</param>
/// <param name="Samples">Number of attractor samples (last states) kept per point.</param>
/// <param name="StepCheck">Flows: analyse every point again with half the step (a hundredth of the tolerances for Dormand–Prince); a different regime or period makes the point unresolved (reason "step").</param>
/// <param name="Indicators">Also compute the 0–1 test, permutation entropy and Lempel–Ziv complexity of the first variable over the last measured iterations (maps; flows: over the last section points or stroboscopic samples, of the first variable other than the section's), and say in the reason when they disagree with the exponents.</param>
/// <param name="TransientCheck">Analyse every point a second time with twice the transient; a different regime or period then makes the point unresolved (reason "transient").</param>
public sealed record AnalysisSettings(
    long Transient = 1000,
    long Measure = 2000,
    LyapunovMode Lyapunov = LyapunovMode.Spectrum,
    int MaxPeriod = 64,
    double Tolerance = 1e-9,
    double Escape = 1e12,
    double ZeroBand = 1e-3,
    int Samples = 16,
    bool TransientCheck = false,
    bool Indicators = false,
    bool StepCheck = false);
