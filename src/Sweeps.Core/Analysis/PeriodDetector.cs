using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

namespace Sweeps.Core.Analysis;

/// <summary>
/// Keeps the last 2·maxPeriod states in a ring and finds the smallest p ≤ maxPeriod for which every
/// state in the window equals the one p steps earlier within tolerance, i.e. the cycle repeated in
/// full at least twice. Requiring the whole window (not one return) keeps slow spirals and near-returns
/// from passing as cycles.
/// </summary>
internal sealed class PeriodDetector
{
    private readonly int n;
    private readonly int maxPeriod;
    private readonly double tolerance;
    private readonly double[] ring;
    private int count;
    private int next;

    public PeriodDetector(int dimension, int maxPeriod, double tolerance)
    {
        n = dimension;
        this.maxPeriod = maxPeriod;
        this.tolerance = tolerance;
        ring = new double[2 * maxPeriod * dimension];
        line = new double[ring.Length];
    }

    // The window in time order, rebuilt by FindPeriod so that its comparisons index plainly (no ring arithmetic).
    private readonly double[] line;

    // What the period test reads: the ring or line, whichever holds the states in time order (set by Linearize).
    private double[] ordered = [];

    public int Capacity => 2 * maxPeriod;

    public int Count => count;

    /// <summary>States pushed since the last reset (the ring keeps the last <see cref="Capacity"/>).</summary>
    public long Pushed { get; private set; }

    public void Reset()
    {
        count = 0;
        next = 0;
        Pushed = 0;
    }

    /// <summary>
    /// Resets to <paramref name="states"/> stored states (at most <see cref="Capacity"/>) and returns their storage, row-major
    /// and oldest first, for the caller to write: the same as that many pushes, without a copy in between.
    /// </summary>
    public Span<double> Fill(int states)
    {
        count = states;
        next = states % Capacity;
        Pushed = states;
        return ring.AsSpan(0, states * n);
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Push(ReadOnlySpan<double> state)
    {
        state.CopyTo(ring.AsSpan(next * n, n));
        next = (next + 1) % Capacity;
        count = Math.Min(count + 1, Capacity);
        Pushed++;
    }

    /// <summary>The i-th stored state, 0 being the oldest.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public ReadOnlySpan<double> State(int i)
    {
        var slot = (next - count + i + Capacity) % Capacity;
        return ring.AsSpan(slot * n, n);
    }

    /// <summary>The last min(<paramref name="count"/>, Count) states, oldest first, row-major.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public double[] Last(int count)
    {
        var states = new double[Math.Min(count, this.count) * n];
        Last(count, states);
        return states;
    }

    /// <summary>As <see cref="Last(int)"/>, into <paramref name="into"/> (room for them); returns the part written.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public ReadOnlySpan<double> Last(int count, Span<double> into)
    {
        count = Math.Min(count, this.count);
        for (var i = 0; i < count; i++)
        {
            State(this.count - count + i).CopyTo(into.Slice(i * n, n));
        }

        return into[..(count * n)];
    }

    /// <summary>The smallest box holding every stored state, or the point <paramref name="fallback"/> when none is stored.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public StateBox Bounds(ReadOnlySpan<double> fallback)
    {
        if (count == 0)
        {
            return StateBox.Point(fallback);
        }

        var low = new double[n];
        var high = new double[n];
        var stored = ring.AsSpan(0, count * n);
        for (var j = 0; j < n; j++)
        {
            // The first count·n slots of the ring hold the stored states; their order does not matter for a box.
            var (least, most) = (stored[j], stored[j]);
            for (var i = j; i < stored.Length; i += n)
            {
                var value = stored[i];
                least = value < least ? value : least;
                most = value > most ? value : most;
            }

            (low[j], high[j]) = (least, most);
        }

        return new StateBox(low, high);
    }

    /// <summary>The period, or 0 when none up to the maximum fits the window.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public int FindPeriod()
    {
        if (count < 2)
        {
            return 0;
        }

        var values = Linearize();
        var last = (count * n) - 1;
        var (latest, scale) = (values[last], 1.0 + Math.Abs(values[last]));
        for (var p = 1; 2 * p <= count; p++)
        {
            // Most candidates fail on the latest value already: test it here before the whole window.
            var earlier = values[last - (p * n)];
            if (!(Math.Abs(latest - earlier) <= tolerance * Math.Max(scale, 1.0 + Math.Abs(earlier))))
            {
                continue;
            }

            if (Repeats(p, tolerance))
            {
                return Smallest(p);
            }
        }

        return 0;
    }

    /// <summary>
    /// Guards against a cycle converging slowly with a multiplier near −1: its returns alternate about
    /// the cycle, so they repeat every 2q steps within tolerance before they repeat every q. Points of a
    /// genuine cycle are macroscopically apart, so a divisor q of p whose returns already agree to
    /// √tolerance is the real period (this only merges cycles born within ~tolerance of a doubling).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private int Smallest(int p)
    {
        var loose = Math.Sqrt(tolerance);
        for (var q = 1; q < p; q++)
        {
            if (p % q == 0 && Repeats(q, loose))
            {
                return q;
            }
        }

        return p;
    }

    /// <summary>Whether every state in the window equals the one p steps earlier: |a − b| ≤ limit · (1 + max(|a|, |b|)) for every component.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private bool Repeats(int p, double limit)
    {
        var values = ordered;
        var shift = p * n;
        var i = (count * n) - 1;

        // Four comparisons at a time from the end (a cycle's window is compared whole): each lane is the scalar test
        // below, so the answer is the same; a NaN fails it either way.
        ref var start = ref MemoryMarshal.GetArrayDataReference(values);
        var bound = Vector256.Create(limit);
        for (; i - 3 >= shift; i -= 4)
        {
            var a = Vector256.LoadUnsafe(ref start, (nuint)(i - 3));
            var b = Vector256.LoadUnsafe(ref start, (nuint)(i - 3 - shift));
            var close = Vector256.LessThanOrEqual(Vector256.Abs(a - b), bound * (Vector256<double>.One + Vector256.Max(Vector256.Abs(a), Vector256.Abs(b))));
            if (close.ExtractMostSignificantBits() != 0xF)
            {
                return false;
            }
        }

        for (; i >= shift; i--)
        {
            var (a, b) = (values[i], values[i - shift]);
            if (!(Math.Abs(a - b) <= limit * (1.0 + Math.Max(Math.Abs(a), Math.Abs(b)))))
            {
                return false;
            }
        }

        return true;
    }

    /// <summary>The stored states, oldest first: the ring itself when they start at its beginning, else a copy in <see cref="line"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private double[] Linearize()
    {
        var start = (next - count + Capacity) % Capacity;
        if (start == 0)
        {
            return ordered = ring;
        }

        var first = Math.Min(count, Capacity - start);
        Array.Copy(ring, start * n, line, 0, first * n);
        Array.Copy(ring, 0, line, first * n, (count - first) * n);
        return ordered = line;
    }
}
