using Sweeps.Core.Analysis;
using Sweeps.Core.Integrators;
using Sweeps.Core.Models;

namespace Sweeps.Engine.Specs;

/// <summary>
/// A validated sweep: the model, the base point (initial state and parameter values), the grid over
/// it and the analysis settings. Everything downstream trusts it without re-checking.
/// </summary>
/// <param name="SourceFile">The config file it came from, as given.</param>
/// <param name="Model">The model text.</param>
/// <param name="Initial">Initial state, in variable order; swept variables hold their axis' first value.</param>
/// <param name="Parameters">Parameter values, in parameter order; swept parameters hold their axis' first value.</param>
/// <param name="Grid">The axes swept.</param>
/// <param name="Analysis">Per-point analysis settings.</param>
/// <param name="Integrator">Flow integration settings.</param>
/// <param name="OutputDirectory">[output] dir, if given.</param>
/// <param name="ChunkSize">[output] chunk_size: points per chunk and part file, if fixed by the config.</param>
/// <param name="Section">The Poincaré section of an autonomous flow.</param>
/// <param name="Starts">Several starts per point, when asked for; null means one start, the point's initial state.</param>
public sealed record SweepSpec(
    string SourceFile,
    ModelSource Model,
    IReadOnlyList<double> Initial,
    IReadOnlyList<double> Parameters,
    Grid Grid,
    AnalysisSettings Analysis,
    IntegratorSettings Integrator,
    string? OutputDirectory,
    long? ChunkSize = null,
    SectionSettings? Section = null,
    StartSpec? Starts = null)
{
    /// <summary>Starting states analysed per parameter point.</summary>
    public int StartCount => Starts?.Count ?? 1;

    /// <summary>Full analyses per grid point: one per start, or two (forward and backward) in a continuation sweep.</summary>
    public int AnalysesPerPoint => Grid.Follow is null ? StartCount : 2;

    /// <summary>
    /// Whether a point can have several outcomes (several starts, or a continuation sweep's two directions): only then
    /// are outcomes grouped into attractors and attractor parts written, and only then do results need their cycle
    /// states and boxes.
    /// </summary>
    public bool GroupsAttractors => StartCount > 1 || Grid.Follow is not null;
}
