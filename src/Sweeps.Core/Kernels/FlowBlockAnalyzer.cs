using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using Sweeps.Core.Analysis;
using Sweeps.Core.Integrators;
using Sweeps.Core.Models;

namespace Sweeps.Core.Kernels;

/// <summary>
/// Analyses flow points integrated with a fixed step (Euler, RK4) four at a time: one generated step
/// (<see cref="FlowKernels.Lanes"/>) advances the four points' states and tangent vectors side by side in
/// <see cref="Vector256{T}"/> lanes. With a fixed step every point steps through the same times, so the phases,
/// the re-orthonormalisation times, the forcing periods and the step budget are shared, and the loop is
/// <see cref="FlowAnalyzer"/>'s, step for step. Whatever happens to one point alone — escape, a non-finite
/// value, a section crossing, the QR step — is done for that lane with the scalar code on the lane's values,
/// through a <see cref="FlowTrack"/> per lane, so each point's result equals the scalar analyzer's bit for bit
/// (tested). A lane whose point has stopped runs on unused until the block ends.
/// </summary>
public sealed class FlowBlockAnalyzer : IBlockAnalyzer
{
    private const int Width = 4;

    private readonly Model model;
    private readonly AnalysisSettings settings;
    private readonly IntegratorSettings integrator;
    private readonly SectionSettings section;
    private readonly Lazy<FlowAnalyzer> scalar;
    private readonly int n;
    private readonly int vectors;
    private readonly int size;
    private readonly double forcingPeriod;
    private readonly LaneStep plainStep;
    private readonly LaneStep tangentStep;
    private readonly OdeSystem tangent;
    private readonly FlowTrack[] tracks = new FlowTrack[Width];
    private readonly PointResult?[] stopped = new PointResult?[Width];
    private readonly double[] frame;
    private readonly Vector256<double>[] p;
    private readonly Vector256<double>[] y;
    private readonly Vector256<double>[] start;
    private readonly Vector256<double>[] slope;
    private readonly double[] lane;
    private readonly Vector256<double>[] saved;
    private readonly Vector256<double>[] norms;
    private readonly double[] trace = new double[Width];
    private readonly double[] traceBefore = new double[Width];
    private readonly long[] crossings = new long[Width];
    private readonly Segment segment;
    private int live;
    private double stepStart;

    public FlowBlockAnalyzer(Model model, AnalysisSettings settings, IntegratorSettings integrator, SectionSettings section)
    {
        if (!Supports(model, integrator))
        {
            throw new ArgumentException("the block analyzer takes flows with a fixed-step integrator", nameof(integrator));
        }

        this.model = model;
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
        forcingPeriod = model.UsesTime ? model.Source.ForcingPeriod ?? throw new ArgumentException("a flow that uses t needs a forcing period") : 0;
        plainStep = FlowKernels.Lanes(model, 0, integrator.Method);
        tangentStep = FlowKernels.Lanes(model, vectors, integrator.Method);
        tangent = new OdeSystem(model, vectors, generated: false); // for the divergence alone, which needs no generated code
        for (var j = 0; j < Width; j++)
        {
            tracks[j] = new FlowTrack(model, settings, section, vectors, forcingPeriod);
        }

        frame = TangentFrame.Initial(n, vectors);
        p = new Vector256<double>[Math.Max(1, model.Parameters.Count)];
        y = new Vector256<double>[size];
        start = new Vector256<double>[n];
        slope = new Vector256<double>[size];
        lane = new double[size];
        saved = new Vector256<double>[Math.Max(1, n * vectors)];
        norms = new Vector256<double>[Math.Max(1, vectors)];
        segment = new Segment(model, n);
    }

    int IBlockAnalyzer.BlockSize => Width;

    IPointAnalyzer IBlockAnalyzer.Scalar => scalar.Value;

    /// <summary>Whether the block analyzer applies: a flow with a fixed-step scheme, on a machine with 256-bit vectors.</summary>
    public static bool Supports(Model model, IntegratorSettings integrator) =>
        model.Kind == ModelKind.Flow && integrator.Method is IntegratorMethod.Euler or IntegratorMethod.Rk4 && Vector256.IsHardwareAccelerated;

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Analyze(double[][] initial, double[][] parameters, int count, PointResult[] results)
    {
        Load(initial, parameters, count);
        var t = 0.0;
        var steps = 0L;
        var level = Transient(ref t, ref steps);
        if (live != 0)
        {
            Measure(t, steps, level);
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

        for (var i = 0; i < p.Length && i < model.Parameters.Count; i++)
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

    /// <summary>The transient on the states alone (the first n entries); returns each lane's section level.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private Vector256<double> Transient(ref double t, ref long steps)
    {
        var meanSum = Vector256<double>.Zero;
        var meanTime = 0.0;
        var transientEnd = (double)settings.Transient;
        var variable = section.Variable;
        while (t < transientEnd && live != 0)
        {
            var before = t;
            if (!Step(plainStep, n, ref t, transientEnd, ref steps, stateAtEnd: true))
            {
                break;
            }

            if (before >= transientEnd / 2)
            {
                meanSum += y[variable] * Vector256.Create(t - before);
                meanTime += t - before;
            }
        }

        if (section.Level is { } fixedLevel)
        {
            return Vector256.Create(fixedLevel);
        }

        return meanTime > 0 ? meanSum / Vector256.Create(meanTime) : y[variable];
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Measure(double t, long steps, Vector256<double> level)
    {
        var forced = forcingPeriod > 0;
        for (var i = 0; i < n * vectors; i++)
        {
            y[n + i] = Vector256.Create(frame[i]);
        }

        var start0 = t;
        var end = start0 + settings.Measure;
        var half = start0 + (settings.Measure / 2.0);
        var halfTime = double.NaN;
        var strobe = forced ? Math.Floor((t / forcingPeriod) + 1e-9) + 1 : 0;
        var lastQr = t;
        System.Array.Clear(trace);
        System.Array.Clear(crossings);
        for (var j = 0; j < Width; j++)
        {
            traceBefore[j] = vectors == n && Live(j) ? Divergence(j, t) : 0;
        }

        var gBefore = y[section.Variable] - level;
        while (t < end && live != 0)
        {
            // Steps end exactly on the next forcing period and on the middle of the measurement.
            var limit = forced ? Math.Min(end, strobe * forcingPeriod) : end;
            if (double.IsNaN(halfTime) && t < half)
            {
                limit = Math.Min(limit, half);
            }

            // Over the budget, the scalar analyzer's state still holds the step's start in this phase.
            if (!Step(tangentStep, size, ref t, limit, ref steps, stateAtEnd: false))
            {
                break;
            }

            if (forced)
            {
                if (t == strobe * forcingPeriod)
                {
                    for (var j = 0; j < Width; j++)
                    {
                        if (Live(j))
                        {
                            Extract(y, j, n, tracks[j].State);
                            tracks[j].Record(tracks[j].State, t);
                            crossings[j]++;
                        }
                    }

                    strobe++;
                }
            }
            else
            {
                var gNow = y[section.Variable] - level;
                var crossed = Crossings(gBefore, gNow) & live;
                while (crossed != 0)
                {
                    var j = System.Numerics.BitOperations.TrailingZeroCount(crossed);
                    crossed &= crossed - 1;
                    segment.Load(start, slope, y, j, tracks[j].Parameters, stepStart, t);
                    var point = tracks[j].Locate(segment, gBefore.GetElement(j), gNow.GetElement(j), level.GetElement(j), out var when);
                    tracks[j].Record(point, when);
                    crossings[j]++;
                }

                gBefore = gNow;
            }

            var halfReached = double.IsNaN(halfTime) && t >= half;
            if (vectors > 0 && (t - lastQr >= FlowAnalyzer.QrInterval || halfReached || t >= end))
            {
                Orthonormalize(t);
                for (var j = 0; j < Width; j++)
                {
                    if (vectors == n && Live(j))
                    {
                        var traceNow = Divergence(j, t);
                        trace[j] += 0.5 * (traceBefore[j] + traceNow) * (t - lastQr);
                        traceBefore[j] = traceNow;
                    }
                }

                lastQr = t;
            }

            if (halfReached)
            {
                halfTime = t - start0;
                for (var j = 0; j < Width; j++)
                {
                    tracks[j].MarkHalf();
                }
            }
        }

        for (var j = 0; j < Width; j++)
        {
            if (Live(j))
            {
                Extract(y, j, n, tracks[j].State);
                Stop(j, tracks[j].Classify(start0, end, halfTime, trace[j], crossings[j]));
            }
        }
    }

    /// <summary>
    /// One step of every lane, then the step budget and the escape test, in the scalar analyzer's order. False when
    /// the phase ends: no step could be taken, or the budget is used up (every live lane stops, its state taken
    /// from the step's end or, with <paramref name="stateAtEnd"/> false, its start).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private bool Step(LaneStep step, int count, ref double t, double limit, ref long steps, bool stateAtEnd)
    {
        if (!Advance(step, count, ref t, limit, steps))
        {
            return false;
        }

        if (++steps > integrator.MaxSteps)
        {
            StopOverBudget(t, stateAtEnd);
            return false;
        }

        StopEscaped(steps, t, n);
        return true;
    }

    /// <summary>
    /// One step of every lane, as <see cref="FixedStepper"/> takes it: the step never passes
    /// <paramref name="limit"/>, and a lane whose first <paramref name="count"/> entries are not all finite
    /// afterwards has failed its step. False when no step could be taken at all.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private bool Advance(LaneStep step, int count, ref double t, double limit, long steps)
    {
        var h = Math.Min(integrator.Step, limit - t);
        if (!(h > 0))
        {
            StopOutOfTime(t, steps);
            return false;
        }

        // Only the states are ever read from the step's start (dense output, failures, the budget): n entries, not all.
        for (var i = 0; i < n; i++)
        {
            start[i] = y[i];
        }

        stepStart = t;
        step(y, p, t, h, slope);
        t = limit - t <= integrator.Step ? limit : t + h;
        var finite = Vector256<double>.AllBitsSet;
        for (var i = 0; i < count; i++)
        {
            finite &= Vector256.Equals(y[i] - y[i], Vector256<double>.Zero);
        }

        var failed = (int)~finite.ExtractMostSignificantBits() & live;
        while (failed != 0)
        {
            var j = System.Numerics.BitOperations.TrailingZeroCount(failed);
            failed &= failed - 1;
            Extract(y, j, n, tracks[j].State);
            Extract(start, j, n, lane);
            Stop(j, tracks[j].StepFailed(lane, $"non-finite value at t = {t:g6}", steps, t));
        }

        return true;
    }

    /// <summary>
    /// The QR step on all lanes at once (<see cref="LaneOrthonormalizer"/>), so each lane gets the scalar bits. A lane
    /// where a norm is zero (a superstable direction) or not finite is done again from its saved vectors by the scalar
    /// code, which handles both.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Orthonormalize(double t)
    {
        var tangents = n * vectors;
        System.Array.Copy(y, n, saved, 0, tangents);
        var unusual = LaneOrthonormalizer.Orthonormalize(y, n, n, vectors, norms);
        for (var j = 0; j < Width; j++)
        {
            if (!Live(j))
            {
                continue;
            }

            if ((unusual & (1 << j)) == 0)
            {
                for (var c = 0; c < vectors; c++)
                {
                    lane[c] = norms[c].GetElement(j);
                }

                tracks[j].AddNorms(lane);
                continue;
            }

            Extract(y, j, n, lane);
            Extract(saved, j, tangents, lane, n);
            if (!tracks[j].Orthonormalize(lane.AsSpan(n, tangents)))
            {
                lane.AsSpan(0, n).CopyTo(tracks[j].State);
                Stop(j, tracks[j].TangentFailed(t));
                continue;
            }

            Insert(lane, j, n, tangents);
        }
    }

    /// <summary>Stops the lanes whose state left ±escape: divergent at this step.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void StopEscaped(long steps, double t, int count)
    {
        var escaped = LaneMath.Escaped(y, count, settings.Escape) & live;
        while (escaped != 0)
        {
            var j = System.Numerics.BitOperations.TrailingZeroCount(escaped);
            escaped &= escaped - 1;
            Extract(y, j, n, tracks[j].State);
            Stop(j, tracks[j].Divergent(steps, t));
        }
    }

    /// <summary>Lanes whose section function went from <paramref name="before"/> to <paramref name="now"/> across the section, as <see cref="FlowTrack.Crosses"/> decides.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private int Crossings(Vector256<double> before, Vector256<double> now)
    {
        var zero = Vector256<double>.Zero;
        var up = Vector256.LessThan(before, zero) & Vector256.GreaterThanOrEqual(now, zero);
        var down = Vector256.GreaterThan(before, zero) & Vector256.LessThanOrEqual(now, zero);
        var crossed = section.Direction switch
        {
            SectionDirection.Up => up,
            SectionDirection.Down => down,
            _ => up | down,
        };
        return (int)crossed.ExtractMostSignificantBits();
    }

    // The rare stops take their lambdas in methods of their own: a lambda in the stepping methods themselves put a
    // closure on the heap at every step (measured: 19 bytes per point and step, 380 KB per Lorenz-type point).
    [MethodImpl(MethodImplOptions.NoInlining)]
    private void StopOverBudget(double now, bool stateAtEnd) => StopAll(j => tracks[j].BudgetUsed(integrator.MaxSteps, now), stateAtEnd, n);

    [MethodImpl(MethodImplOptions.NoInlining)]
    private void StopOutOfTime(double now, long taken) =>
        StopAll(j => tracks[j].StepFailed(tracks[j].State, "no time left to step", taken, now), endState: true, n);

    /// <summary>Stops every live lane, its state taken from the step's end or its start.</summary>
    private void StopAll(Func<int, PointResult> result, bool endState, int count)
    {
        for (var j = 0; j < Width; j++)
        {
            if (Live(j))
            {
                Extract(endState ? y : start, j, count, tracks[j].State);
                Stop(j, result(j));
            }
        }
    }

    private bool Live(int j) => (live & (1 << j)) != 0;

    private void Stop(int j, PointResult result)
    {
        stopped[j] = result;
        live &= ~(1 << j);
    }

    /// <summary>∇·f of lane <paramref name="j"/>'s state at time <paramref name="t"/>.</summary>
    private double Divergence(int j, double t)
    {
        Extract(y, j, n, lane);
        tangent.Parameters = tracks[j].Parameters;
        return tangent.Divergence(t, lane);
    }

    private static void Extract(Vector256<double>[] values, int j, int count, double[] into, int at = 0)
    {
        for (var i = 0; i < count; i++)
        {
            into[at + i] = values[i].GetElement(j);
        }
    }

    /// <summary>Writes entries [from, from + count) of <paramref name="values"/> back into lane <paramref name="j"/>.</summary>
    private void Insert(double[] values, int j, int from, int count)
    {
        for (var i = from; i < from + count; i++)
        {
            y[i] = y[i].WithElement(j, values[i]);
        }
    }

    /// <summary>One lane's last step as dense output: the cubic Hermite interpolant of <see cref="FixedStepper"/>.</summary>
    private sealed class Segment(Model model, int n) : IDenseOutput
    {
        private readonly double[] start = new double[n];
        private readonly double[] startSlope = new double[n];
        private readonly double[] end = new double[n];
        private readonly double[] endSlope = new double[n];
        private double[] parameters = [];
        private bool endSlopeKnown;

        public double StartTime { get; private set; }

        public double EndTime { get; private set; }

        public void Load(Vector256<double>[] startValues, Vector256<double>[] slopes, Vector256<double>[] endValues, int j, double[] pointParameters, double startTime, double endTime)
        {
            Extract(startValues, j, n, start);
            Extract(slopes, j, n, startSlope);
            Extract(endValues, j, n, end);
            parameters = pointParameters;
            (StartTime, EndTime) = (startTime, endTime);
            endSlopeKnown = false;
        }

        public void Interpolate(double theta, double[] output, int count)
        {
            if (!endSlopeKnown)
            {
                model.Evaluate(end, parameters, EndTime, endSlope);
                endSlopeKnown = true;
            }

            FixedStepper.Hermite(theta, EndTime - StartTime, start, startSlope, end, endSlope, output, count);
        }
    }
}
