using CsCheck;
using Sweeps.Core.Analysis;

namespace Sweeps.Core.Tests.Analysis;

/// <summary>
/// The period test against its rule written out plainly: the smallest p with 2p ≤ stored states for which every
/// stored component equals the one p states earlier within |a − b| ≤ tol·(1 + max(|a|, |b|)), then the smallest
/// divisor of p whose returns agree to √tol. Windows hold planted cycles with perturbations just inside and just
/// outside the tolerance, in one to three variables, pushed through the ring with wrap-around.
/// </summary>
public sealed class PeriodDetectorTests
{
    [Fact]
    public void FindPeriod_FollowsTheRule_ForCyclesNearTheTolerance()
    {
        var windows = Gen.Select(Gen.Int[1, 3], Gen.Int[2, 16], Gen.Int[1, 16], Gen.Int[0, 200], Gen.Int[0, int.MaxValue]);
        windows.Sample((n, maxPeriod, cycle, pushes, seed) =>
        {
            const double Tolerance = 1e-6;
            var random = new Random(seed);
            var cycleStates = Enumerable.Range(0, cycle * n).Select(_ => random.Next(4) == 0 ? 0.0 : (random.NextDouble() - 0.5) * Math.Pow(10, random.Next(-3, 4))).ToArray();
            // Multiples of the tolerance: well inside, around it, far outside, and on the boundary itself (d = tol·(1 + |v| + d)).
            double[] factors = [0, 0.5, 0.999, 1.001, 2, 1e3, 1 / (1 - Tolerance), (1 - 1e-8) / (1 - Tolerance), (1 + 1e-8) / (1 - Tolerance)];
            var detector = new PeriodDetector(n, maxPeriod, Tolerance);
            var history = new List<double[]>();
            for (var k = 0; k < pushes; k++)
            {
                var state = new double[n];
                for (var j = 0; j < n; j++)
                {
                    var value = cycleStates[((k % cycle) * n) + j];
                    var nudge = random.Next(6) == 0 ? factors[random.Next(factors.Length)] * Tolerance * (1 + Math.Abs(value)) * (random.Next(2) == 0 ? -1 : 1) : 0;
                    state[j] = value + nudge;
                }

                detector.Push(state);
                history.Add(state);
            }

            var stored = history.Skip(Math.Max(0, history.Count - detector.Capacity)).ToList();
            return detector.FindPeriod() == Rule(stored, maxPeriod, Tolerance);
        });
    }

    private static int Rule(List<double[]> states, int maxPeriod, double tolerance)
    {
        for (var p = 1; p <= maxPeriod && 2 * p <= states.Count; p++)
        {
            if (Returns(states, p, tolerance))
            {
                for (var q = 1; q < p; q++)
                {
                    if (p % q == 0 && Returns(states, q, Math.Sqrt(tolerance)))
                    {
                        return q;
                    }
                }

                return p;
            }
        }

        return 0;
    }

    private static bool Returns(List<double[]> states, int p, double limit)
    {
        for (var i = p; i < states.Count; i++)
        {
            for (var j = 0; j < states[i].Length; j++)
            {
                var (a, b) = (states[i][j], states[i - p][j]);
                if (!(Math.Abs(a - b) <= limit * (1 + Math.Max(Math.Abs(a), Math.Abs(b)))))
                {
                    return false;
                }
            }
        }

        return true;
    }
}
