using System.Runtime.CompilerServices;
using Sweeps.Core.Integrators;
using Sweeps.Core.Models;

namespace Sweeps.Core.Analysis;

/// <summary>
/// Analyses points of an ODE flow: a transient integrated on the state alone, then a measured phase
/// on the state with its tangent vectors (variational equations, exact Jacobian) re-orthonormalised
/// by QR every <see cref="QrInterval"/> time units (Benettin et al., Meccanica 15, 1980), while
/// crossings of the Poincaré section are located on the integrator's dense output — or, for a forced
/// flow, the state is sampled once per forcing period (the stroboscopic map). The section points feed
/// the same period test as a map's orbit. One instance per thread; buffers are reused across points.
/// </summary>
public sealed class FlowAnalyzer : IPointAnalyzer
{
    /// <summary>
    /// Time between re-orthonormalisations. Over 0.1 time units tangent vectors separate by
    /// e^{0.1·(λ1 − λn)}, far from the 1e16 at which doubles lose the smaller directions for any
    /// spectrum narrower than a few hundred per unit time.
    /// </summary>
    public const double QrInterval = 0.1;

    private readonly Model model;
    private readonly AnalysisSettings settings;
    private readonly IntegratorSettings integrator;
    private readonly SectionSettings section;
    private readonly int n;
    private readonly int vectors;
    private readonly OdeSystem plain;
    private readonly OdeSystem tangent;
    private readonly Stepper plainStepper;
    private readonly Stepper tangentStepper;
    private readonly double[] augmented;
    private readonly FlowTrack track;

    // The starting tangent frame is the same for every point: built once, copied per point.
    private readonly double[] frame;

    public FlowAnalyzer(Model model, AnalysisSettings settings, IntegratorSettings integrator, SectionSettings section)
        : this(model, settings, integrator, section, generated: true)
    {
    }

    private FlowAnalyzer(Model model, AnalysisSettings settings, IntegratorSettings integrator, SectionSettings section, bool generated)
    {
        if (model.Kind != ModelKind.Flow)
        {
            throw new ArgumentException("FlowAnalyzer needs a flow model", nameof(model));
        }

        this.model = model;
        this.settings = settings;
        this.integrator = integrator;
        this.section = section;
        n = model.Dimension;
        var forcingPeriod = model.UsesTime ? model.Source.ForcingPeriod ?? throw new ArgumentException("a flow that uses t needs a forcing period") : 0;
        vectors = settings.Lyapunov switch
        {
            LyapunovMode.Spectrum => n,
            LyapunovMode.Largest => 1,
            _ => 0,
        };
        plain = new OdeSystem(model, 0, generated);
        tangent = new OdeSystem(model, vectors, generated);
        plainStepper = Stepper.Create(plain, integrator);
        tangentStepper = Stepper.Create(tangent, integrator);
        augmented = new double[tangent.Dimension];
        frame = TangentFrame.Initial(n, vectors);
        track = new FlowTrack(model, settings, section, vectors, forcingPeriod);
    }

    /// <summary>The same analysis on the plain reference loops instead of generated code (for tests of the generated code).</summary>
    internal static FlowAnalyzer Reference(Model model, AnalysisSettings settings, IntegratorSettings integrator, SectionSettings section) =>
        new(model, settings, integrator, section, generated: false);

    /// <summary>Fewest recorded values the indicators are computed from; with fewer they are NaN.</summary>
    public const int IndicatorMinimum = 64;

    public bool Forced => track.Forced;

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public PointResult Analyze(ReadOnlySpan<double> initial, double[] parameters)
    {
        var state = track.State;
        initial.CopyTo(state);
        plain.Parameters = parameters;
        tangent.Parameters = parameters;
        plainStepper.Reset();
        tangentStepper.Reset();
        track.Reset(parameters);
        if (!PointResult.Bounded(state, settings.Escape))
        {
            return track.Divergent(0, 0);
        }

        // Transient: the state alone; the section level defaults to the mean over its second half.
        var t = 0.0;
        var steps = 0L;
        var (meanSum, meanTime) = (0.0, 0.0);
        var transientEnd = (double)settings.Transient;
        while (t < transientEnd)
        {
            var before = t;
            if (!plainStepper.Advance(state, ref t, transientEnd))
            {
                return track.StepFailed(plainStepper.Start, plainStepper.Failure!, steps, t);
            }

            if (++steps > integrator.MaxSteps)
            {
                return track.BudgetUsed(integrator.MaxSteps, t);
            }

            if (!PointResult.Bounded(state, settings.Escape))
            {
                return track.Divergent(steps, t);
            }

            if (before >= transientEnd / 2)
            {
                meanSum += state[section.Variable] * (t - before);
                meanTime += t - before;
            }
        }

        var level = section.Level ?? (meanTime > 0 ? meanSum / meanTime : state[section.Variable]);
        return Measure(t, steps, level);
    }

    private PointResult Measure(double t, long steps, double level)
    {
        var state = track.State;
        var forcingPeriod = track.Forced ? model.Source.ForcingPeriod!.Value : 0;
        Array.Copy(state, augmented, n);
        frame.CopyTo(augmented, n);
        var start = t;
        var end = start + settings.Measure;
        var half = start + (settings.Measure / 2.0);
        var halfTime = double.NaN;
        var strobe = Forced ? Math.Floor((t / forcingPeriod) + 1e-9) + 1 : 0;
        var lastQr = t;
        var crossings = 0L;
        var trace = 0.0;
        var traceBefore = vectors == n ? tangent.Divergence(t, augmented) : 0;
        var gBefore = augmented[section.Variable] - level;
        while (t < end)
        {
            // Steps end exactly on the next forcing period and on the middle of the measurement.
            var limit = Forced ? Math.Min(end, strobe * forcingPeriod) : end;
            if (double.IsNaN(halfTime) && t < half)
            {
                limit = Math.Min(limit, half);
            }

            if (!tangentStepper.Advance(augmented, ref t, limit))
            {
                Array.Copy(augmented, state, n);
                return track.StepFailed(tangentStepper.Start, tangentStepper.Failure!, steps, t);
            }

            if (++steps > integrator.MaxSteps)
            {
                return track.BudgetUsed(integrator.MaxSteps, t);
            }

            Array.Copy(augmented, state, n);
            if (!PointResult.Bounded(state, settings.Escape))
            {
                return track.Divergent(steps, t);
            }

            if (Forced)
            {
                if (t == strobe * forcingPeriod)
                {
                    track.Record(state, t);
                    crossings++;
                    strobe++;
                }
            }
            else
            {
                var gNow = augmented[section.Variable] - level;
                if (track.Crosses(gBefore, gNow))
                {
                    track.Record(track.Locate(tangentStepper, gBefore, gNow, level, out var when), when);
                    crossings++;
                }

                gBefore = gNow;
            }

            var halfReached = double.IsNaN(halfTime) && t >= half;
            if (vectors > 0 && (t - lastQr >= QrInterval || halfReached || t >= end))
            {
                if (!track.Orthonormalize(augmented.AsSpan(n, n * vectors)))
                {
                    return track.TangentFailed(t);
                }

                tangentStepper.StateChanged();

                // The divergence for the Σλ check, by the trapezoid rule between re-orthonormalisations:
                // exact for the constant divergence of many models, O(Δt²) otherwise, and one Jacobian
                // per interval instead of one per step.
                if (vectors == n)
                {
                    var traceNow = tangent.Divergence(t, augmented);
                    trace += 0.5 * (traceBefore + traceNow) * (t - lastQr);
                    traceBefore = traceNow;
                }

                lastQr = t;
            }

            if (halfReached)
            {
                halfTime = t - start;
                track.MarkHalf();
            }
        }

        return track.Classify(start, end, halfTime, trace, crossings);
    }
}
