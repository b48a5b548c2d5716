using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using Sweeps.Core.Analysis;
using Sweeps.Core.Integrators;
using Sweeps.Core.Models;

namespace Sweeps.Core.Kernels;

/// <summary>
/// Analyses flow points integrated with adaptive Dormand–Prince steps four at a time: one generated trial step
/// (<see cref="DormandPrinceKernel.Lanes"/>) advances the four points' states and tangent vectors side by side in
/// <see cref="Vector256{T}"/> lanes, each lane with its own time and step size. Every lane keeps the scalar
/// stepper's memory (step size, first-same-as-last slope, step count) and goes through <see cref="FlowAnalyzer"/>'s
/// loop on its own clock: a trial is accepted or rejected lane by lane, and what follows an accepted step — budget,
/// escape, stroboscopic sample or section crossing on the step's dense output, the QR step, the middle and the end
/// of the measurement — is done for that lane with the scalar code through a <see cref="FlowTrack"/> per lane. So
/// each point's result equals the scalar analyzer's bit for bit (tested). The lanes share the phases: a lane that
/// has finished its transient waits for the others before the measurement starts; a stopped lane runs on unused.
/// </summary>
public sealed partial class DormandPrinceBlockAnalyzer : IBlockAnalyzer
{
    private const int Width = 4;
    private const int AllLanes = (1 << Width) - 1;

    private readonly AnalysisSettings settings;
    private readonly IntegratorSettings integrator;
    private readonly SectionSettings section;
    private readonly Lazy<FlowAnalyzer> scalar;
    private readonly int n;
    private readonly int vectors;
    private readonly int size;
    private readonly int parameterCount;
    private readonly double forcingPeriod;
    private readonly DormandPrinceLaneStages plainStages;
    private readonly DormandPrinceLaneStages tangentStages;
    private readonly LaneField plainSlope;
    private readonly LaneField tangentSlope;
    private readonly OdeSystem tangent;
    private readonly FlowTrack[] tracks = new FlowTrack[Width];
    private readonly PointResult?[] stopped = new PointResult?[Width];
    private readonly double[] frame;
    private readonly Vector256<double>[] p;
    private readonly Vector256<double>[] y;
    private readonly Vector256<double>[] start;
    private readonly Vector256<double>[] k1, k2, k3, k4, k5, k6, k7, next, fresh;
    private readonly Vector256<double>[] saved;
    private readonly Vector256<double>[] norms;
    private readonly double[] lane;
    private readonly Segment segment;

    // Each lane's clock and stepper memory: time, the step size to try next, the trial step, the time before the last
    // accepted step, the limit of the current step, accepted steps.
    private readonly double[] time = new double[Width];
    private readonly double[] stepSize = new double[Width];
    private readonly double[] trial = new double[Width];
    private readonly double[] before = new double[Width];
    private readonly double[] limit = new double[Width];
    private readonly long[] steps = new long[Width];

    // The transient's running mean of the section variable; the measurement's bookkeeping.
    private readonly double[] meanSum = new double[Width];
    private readonly double[] meanTime = new double[Width];
    private readonly double[] level = new double[Width];
    private readonly double[] measureStart = new double[Width];
    private readonly double[] measureEnd = new double[Width];
    private readonly double[] measureHalf = new double[Width];
    private readonly double[] strobe = new double[Width];
    private readonly double[] lastQr = new double[Width];
    private readonly double[] halfTime = new double[Width];
    private readonly double[] trace = new double[Width];
    private readonly double[] traceBefore = new double[Width];
    private readonly double[] gBefore = new double[Width];
    private readonly long[] crossings = new long[Width];

    // Lanes as bits: points not yet stopped, lanes stepping in the current phase, lanes whose start slope k1 is known.
    private int live;
    private int active;
    private int slopeKnown;

    public DormandPrinceBlockAnalyzer(Model model, AnalysisSettings settings, IntegratorSettings integrator, SectionSettings section)
    {
        if (!Supports(model, integrator))
        {
            throw new ArgumentException("this block analyzer takes flows integrated with Dormand–Prince", nameof(integrator));
        }

        this.settings = settings;
        this.integrator = integrator;
        this.section = section;
        // Only for blocks that fail: built (and its scalar kernels compiled) when first needed.
        scalar = new Lazy<FlowAnalyzer>(() => new FlowAnalyzer(model, settings, integrator, section));
        n = model.Dimension;
        vectors = settings.Lyapunov switch
        {
            LyapunovMode.Spectrum => n,
            LyapunovMode.Largest => 1,
            _ => 0,
        };
        size = n * (1 + vectors);
        parameterCount = model.Parameters.Count;
        forcingPeriod = model.UsesTime ? model.Source.ForcingPeriod ?? throw new ArgumentException("a flow that uses t needs a forcing period") : 0;
        plainStages = DormandPrinceKernel.Lanes(model, 0);
        tangentStages = DormandPrinceKernel.Lanes(model, vectors);
        plainSlope = FlowKernels.LaneDerivative(model, 0);
        tangentSlope = FlowKernels.LaneDerivative(model, vectors);
        tangent = new OdeSystem(model, vectors, generated: false); // for the divergence alone, which needs no generated code
        for (var j = 0; j < Width; j++)
        {
            tracks[j] = new FlowTrack(model, settings, section, vectors, forcingPeriod);
        }

        frame = TangentFrame.Initial(n, vectors);
        p = new Vector256<double>[Math.Max(1, model.Parameters.Count)];
        Vector256<double>[] Buffer() => new Vector256<double>[size];
        (y, fresh, next) = (Buffer(), Buffer(), Buffer());

        // Only the states are read from a step's start (the dense output, the budget).
        start = new Vector256<double>[n];
        (k1, k2, k3, k4, k5, k6, k7) = (Buffer(), Buffer(), Buffer(), Buffer(), Buffer(), Buffer(), Buffer());
        saved = new Vector256<double>[Math.Max(1, n * vectors)];
        norms = new Vector256<double>[Math.Max(1, vectors)];
        lane = new double[size];
        segment = new Segment(n);
    }

    int IBlockAnalyzer.BlockSize => Width;

    IPointAnalyzer IBlockAnalyzer.Scalar => scalar.Value;

    /// <summary>Whether the block analyzer applies: a flow integrated with Dormand–Prince, on a machine with 256-bit vectors.</summary>
    public static bool Supports(Model model, IntegratorSettings integrator) =>
        model.Kind == ModelKind.Flow && integrator.Method == IntegratorMethod.Dopri5 && Vector256.IsHardwareAccelerated;

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Analyze(double[][] initial, double[][] parameters, int count, PointResult[] results)
    {
        Load(initial, parameters, count);
        Transient();
        if (live != 0)
        {
            Measure();
        }

        for (var j = 0; j < count; j++)
        {
            results[j] = stopped[j]!;
        }
    }

    private void Load(double[][] initial, double[][] parameters, int count)
    {
        live = 0;
        for (var j = 0; j < Width; j++)
        {
            // Spare lanes repeat the first point and are never reported.
            var source = j < count ? j : 0;
            tracks[j].Reset(parameters[source]);
            stopped[j] = null;
            initial[source].AsSpan(0, n).CopyTo(tracks[j].State);
            live |= j < count ? 1 << j : 0;
        }

        for (var i = 0; i < p.Length && i < parameterCount; i++)
        {
            p[i] = Vector256.Create(Lane(parameters, count, 0, i), Lane(parameters, count, 1, i), Lane(parameters, count, 2, i), Lane(parameters, count, 3, i));
        }

        for (var i = 0; i < n; i++)
        {
            y[i] = Vector256.Create(tracks[0].State[i], tracks[1].State[i], tracks[2].State[i], tracks[3].State[i]);
        }

        for (var j = 0; j < Width; j++)
        {
            if (Live(j) && !PointResult.Bounded(tracks[j].State, settings.Escape))
            {
                Stop(j, tracks[j].Divergent(0, 0));
            }
        }
    }

    private static double Lane(double[][] values, int count, int j, int i) => values[j < count ? j : 0][i];

    /// <summary>The transient on the states alone (the first n entries); leaves each lane's section level.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Transient()
    {
        var transientEnd = (double)settings.Transient;
        var variable = section.Variable;
        for (var j = 0; j < Width; j++)
        {
            (time[j], steps[j], stepSize[j], limit[j], meanSum[j], meanTime[j]) = (0, 0, integrator.Step, transientEnd, 0, 0);
        }

        active = transientEnd > 0 ? live : 0;
        slopeKnown = 0;
        while (active != 0)
        {
            var accepted = Trial(plainStages, plainSlope, n);
            var escaped = LaneMath.Escaped(y, n, settings.Escape);
            foreach (var j in Lanes(accepted))
            {
                if (++steps[j] > integrator.MaxSteps)
                {
                    Extract(y, j, n, tracks[j].State);
                    Stop(j, tracks[j].BudgetUsed(integrator.MaxSteps, time[j]));
                    continue;
                }

                if ((escaped & (1 << j)) != 0)
                {
                    Extract(y, j, n, tracks[j].State);
                    Stop(j, tracks[j].Divergent(steps[j], time[j]));
                    continue;
                }

                if (before[j] >= transientEnd / 2)
                {
                    meanSum[j] += y[variable].GetElement(j) * (time[j] - before[j]);
                    meanTime[j] += time[j] - before[j];
                }

                if (!(time[j] < transientEnd))
                {
                    active &= ~(1 << j);
                }
            }
        }

        foreach (var j in Lanes(live))
        {
            level[j] = section.Level ?? (meanTime[j] > 0 ? meanSum[j] / meanTime[j] : y[variable].GetElement(j));
        }
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Measure()
    {
        var forced = forcingPeriod > 0;
        for (var i = 0; i < n * vectors; i++)
        {
            y[n + i] = Vector256.Create(frame[i]);
        }

        var variable = section.Variable;
        active = 0;
        foreach (var j in Lanes(live))
        {
            var t = time[j];
            measureStart[j] = t;
            measureEnd[j] = t + settings.Measure;
            measureHalf[j] = t + (settings.Measure / 2.0);
            halfTime[j] = double.NaN;
            strobe[j] = forced ? Math.Floor((t / forcingPeriod) + 1e-9) + 1 : 0;
            lastQr[j] = t;
            (trace[j], crossings[j], stepSize[j]) = (0, 0, integrator.Step);
            traceBefore[j] = vectors == n ? Divergence(j, t) : 0;
            gBefore[j] = y[variable].GetElement(j) - level[j];
            active |= t < measureEnd[j] ? 1 << j : 0;
        }

        slopeKnown = 0;
        while (active != 0)
        {
            foreach (var j in Lanes(active))
            {
                // Steps end exactly on the next forcing period and on the middle of the measurement.
                var (end, half) = (measureEnd[j], measureHalf[j]);
                limit[j] = forced ? Math.Min(end, strobe[j] * forcingPeriod) : end;
                if (double.IsNaN(halfTime[j]) && time[j] < half)
                {
                    limit[j] = Math.Min(limit[j], half);
                }
            }

            var accepted = Trial(tangentStages, tangentSlope, size);
            var escaped = LaneMath.Escaped(y, n, settings.Escape);
            var (qr, halves) = (0, 0);
            foreach (var j in Lanes(accepted))
            {
                var t = time[j];
                if (++steps[j] > integrator.MaxSteps)
                {
                    // The scalar analyzer's state still holds the step's start.
                    Extract(start, j, n, tracks[j].State);
                    Stop(j, tracks[j].BudgetUsed(integrator.MaxSteps, t));
                    continue;
                }

                Extract(y, j, n, tracks[j].State);
                if ((escaped & (1 << j)) != 0)
                {
                    Stop(j, tracks[j].Divergent(steps[j], t));
                    continue;
                }

                if (forced)
                {
                    if (t == strobe[j] * forcingPeriod)
                    {
                        tracks[j].Record(tracks[j].State, t);
                        crossings[j]++;
                        strobe[j]++;
                    }
                }
                else
                {
                    var gNow = y[variable].GetElement(j) - level[j];
                    if (tracks[j].Crosses(gBefore[j], gNow))
                    {
                        segment.Load(this, j);
                        tracks[j].Record(tracks[j].Locate(segment, gBefore[j], gNow, level[j], out var when), when);
                        crossings[j]++;
                    }

                    gBefore[j] = gNow;
                }

                var halfReached = double.IsNaN(halfTime[j]) && t >= measureHalf[j];
                if (vectors > 0 && (t - lastQr[j] >= FlowAnalyzer.QrInterval || halfReached || t >= measureEnd[j]))
                {
                    qr |= 1 << j;
                }

                halves |= halfReached ? 1 << j : 0;
            }

            if (qr != 0)
            {
                Orthonormalize(qr);
            }

            foreach (var j in Lanes(accepted & live))
            {
                var t = time[j];
                if ((qr & (1 << j)) != 0)
                {
                    // The divergence for the Σλ check, by the trapezoid rule between re-orthonormalisations (as the scalar analyzer).
                    slopeKnown &= ~(1 << j);
                    if (vectors == n)
                    {
                        var traceNow = Divergence(j, t);
                        trace[j] += 0.5 * (traceBefore[j] + traceNow) * (t - lastQr[j]);
                        traceBefore[j] = traceNow;
                    }

                    lastQr[j] = t;
                }

                if ((halves & (1 << j)) != 0)
                {
                    halfTime[j] = t - measureStart[j];
                    tracks[j].MarkHalf();
                }

                if (!(t < measureEnd[j]))
                {
                    Classify(j);
                }
            }
        }

        // Lanes whose measurement was empty from the start (no time to measure), as the scalar loop that never ran.
        foreach (var j in Lanes(live))
        {
            Classify(j);
        }
    }

    private void Classify(int j)
    {
        Extract(y, j, n, tracks[j].State);
        Stop(j, tracks[j].Classify(measureStart[j], measureEnd[j], halfTime[j], trace[j], crossings[j]));
    }
}
