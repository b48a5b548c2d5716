using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using Sweeps.Core.Analysis;
using Sweeps.Core.Integrators;

namespace Sweeps.Core.Kernels;

/// <summary>The lane-wise steps of <see cref="DormandPrinceBlockAnalyzer"/>: trial steps, the QR step, and the lane bookkeeping.</summary>
public sealed partial class DormandPrinceBlockAnalyzer
{
    /// <summary>
    /// One trial step of every active lane, as <see cref="DormandPrinceStepper.Advance"/> takes them one after another:
    /// the start slope where it is not known, the step never past the lane's limit, the step size shrunk after a
    /// rejected or non-finite trial and grown after an accepted one (<see cref="StepControl"/>, one root for all lanes). Lanes whose step cannot be taken stop. Returns the
    /// lanes that accepted their step; those have their new time, state and start slope (the old one in k7).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private int Trial(DormandPrinceLaneStages stages, LaneField derivative, int count)
    {
        var stale = active & ~slopeKnown;
        if (stale != 0)
        {
            derivative(y, p, Vector256.Create(time[0], time[1], time[2], time[3]), fresh);
            var mask = LaneMath.Mask(stale);
            for (var i = 0; i < count; i++)
            {
                k1[i] = Vector256.ConditionalSelect(mask, fresh[i], k1[i]);
            }

            slopeKnown |= stale;
        }

        for (var j = 0; j < Width; j++)
        {
            trial[j] = 0;
            if ((active & (1 << j)) == 0)
            {
                continue;
            }

            var t = time[j];
            var h = Math.Min(stepSize[j], limit[j] - t);
            if (!(h > 0))
            {
                StepFailed(j, "no time left to step");
            }
            else if (h < integrator.MinStep && limit[j] - t > integrator.MinStep)
            {
                StepFailed(j, DormandPrinceStepper.MinStepFailure(integrator.MinStep, t));
            }
            else
            {
                trial[j] = h;
            }
        }

        if (active == 0)
        {
            return 0;
        }

        var errors = stages(
            y, p, Vector256.Create(time[0], time[1], time[2], time[3]), Vector256.Create(trial[0], trial[1], trial[2], trial[3]), k1, k2, k3, k4, k5, k6, k7, next, integrator.AbsoluteTolerance, integrator.RelativeTolerance);
        var roots = StepControl.InverseFifthRoot(errors);
        var accepted = 0;
        foreach (var j in Lanes(active))
        {
            var (error, h) = (errors.GetElement(j), trial[j]);
            if (!double.IsFinite(error))
            {
                // As the scalar stepper: a non-finite trial shrinks hard and tries again.
                stepSize[j] = h * 0.1;
            }
            else if (error <= 1.0)
            {
                accepted |= 1 << j;
                before[j] = time[j];
                time[j] = h == limit[j] - time[j] ? limit[j] : time[j] + h;
                stepSize[j] = Math.Min(integrator.MaxStep, h * StepControl.Growth(error, roots.GetElement(j)));
            }
            else
            {
                stepSize[j] = h * StepControl.Shrinkage(error, roots.GetElement(j));
            }
        }

        if (accepted != 0)
        {
            // Accepted lanes move on; their start and end slopes trade places (first same as last). Of the step's start
            // and start slope only the states are ever read again (dense output, budget); the next trial writes k7 anew.
            var mask = LaneMath.Mask(accepted);
            for (var i = 0; i < count; i++)
            {
                var slope = k1[i];
                k1[i] = Vector256.ConditionalSelect(mask, k7[i], slope);
                if (i < n)
                {
                    start[i] = Vector256.ConditionalSelect(mask, y[i], start[i]);
                    k7[i] = Vector256.ConditionalSelect(mask, slope, k7[i]);
                }

                y[i] = Vector256.ConditionalSelect(mask, next[i], y[i]);
            }
        }

        return accepted;
    }

    /// <summary>A lane whose step cannot be taken stops: blown up or unresolved, from its current state (<see cref="FlowTrack.StepFailed"/>).</summary>
    private void StepFailed(int j, string failure)
    {
        Extract(y, j, n, tracks[j].State);
        Stop(j, tracks[j].StepFailed(tracks[j].State, failure, steps[j], time[j]));
    }

    /// <summary>
    /// The QR step on all lanes at once (<see cref="LaneOrthonormalizer"/>), kept for the lanes in
    /// <paramref name="due"/>; the others get their vectors back. A lane where a norm is zero or not finite is done
    /// again from its saved vectors by the scalar code, which handles both.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Orthonormalize(int due)
    {
        var tangents = n * vectors;
        System.Array.Copy(y, n, saved, 0, tangents);
        var unusual = LaneOrthonormalizer.Orthonormalize(y, n, n, vectors, norms);
        var keep = LaneMath.Mask(AllLanes & ~due);
        for (var i = 0; i < tangents; i++)
        {
            y[n + i] = Vector256.ConditionalSelect(keep, saved[i], y[n + i]);
        }

        foreach (var j in Lanes(due))
        {
            if ((unusual & (1 << j)) == 0)
            {
                for (var c = 0; c < vectors; c++)
                {
                    lane[c] = norms[c].GetElement(j);
                }

                tracks[j].AddNorms(lane.AsSpan(0, vectors));
                continue;
            }

            Extract(y, j, n, lane);
            Extract(saved, j, tangents, lane, n);
            if (!tracks[j].Orthonormalize(lane.AsSpan(n, tangents)))
            {
                Stop(j, tracks[j].TangentFailed(time[j]));
                continue;
            }

            for (var i = n; i < n + tangents; i++)
            {
                y[i] = y[i].WithElement(j, lane[i]);
            }
        }
    }

    private bool Live(int j) => (live & (1 << j)) != 0;

    private void Stop(int j, PointResult result)
    {
        stopped[j] = result;
        live &= ~(1 << j);
        active &= ~(1 << j);
    }

    /// <summary>∇·f of lane <paramref name="j"/>'s state at time <paramref name="t"/>.</summary>
    private double Divergence(int j, double t)
    {
        Extract(y, j, n, lane);
        tangent.Parameters = tracks[j].Parameters;
        return tangent.Divergence(t, lane);
    }

    /// <summary>The lanes set in <paramref name="lanes"/>, lowest first.</summary>
    private static LaneSet Lanes(int lanes) => new(lanes);

    private static void Extract(Vector256<double>[] values, int j, int count, double[] into, int at = 0)
    {
        for (var i = 0; i < count; i++)
        {
            into[at + i] = values[i].GetElement(j);
        }
    }

    /// <summary>The lanes of a bit set, enumerated without allocation.</summary>
    private readonly struct LaneSet(int bits)
    {
        public Enumerator GetEnumerator() => new(bits);

        public struct Enumerator(int bits)
        {
            private int rest = bits;

            public int Current { get; private set; }

            public bool MoveNext()
            {
                if (rest == 0)
                {
                    return false;
                }

                Current = BitOperations.TrailingZeroCount(rest);
                rest &= rest - 1;
                return true;
            }
        }
    }

    /// <summary>One lane's last accepted step as dense output: the Dormand–Prince continuous extension the scalar stepper interpolates on.</summary>
    private sealed class Segment(int n) : IDenseOutput
    {
        private readonly double[] start = new double[n], end = new double[n], startSlope = new double[n], endSlope = new double[n];
        private readonly double[] k3 = new double[n], k4 = new double[n], k5 = new double[n], k6 = new double[n];
        private readonly DormandPrinceStepper.Dense dense = new(n);

        public double StartTime { get; private set; }

        public double EndTime { get; private set; }

        public void Load(DormandPrinceBlockAnalyzer owner, int j)
        {
            // After acceptance the slopes have traded places: k7 holds the step's start slope, k1 its end slope.
            Extract(owner.start, j, n, start);
            Extract(owner.y, j, n, end);
            Extract(owner.k7, j, n, startSlope);
            Extract(owner.k1, j, n, endSlope);
            Extract(owner.k3, j, n, k3);
            Extract(owner.k4, j, n, k4);
            Extract(owner.k5, j, n, k5);
            Extract(owner.k6, j, n, k6);
            (StartTime, EndTime) = (owner.before[j], owner.time[j]);
            dense.Prepare(owner.trial[j], start, end, startSlope, k3, k4, k5, k6, endSlope);
        }

        public void Interpolate(double theta, double[] output, int count) => dense.Interpolate(theta, output, count);
    }
}
