using System.Runtime.Intrinsics;
using CsCheck;
using Sweeps.Core.Integrators;

namespace Sweeps.Core.Tests.Integrators;

/// <summary>
/// The step-size rule's factor 0.9·e^(−1/5) within [0.2, 5] (common practice for 5(4) pairs) against the platform's
/// power function (an independent implementation), and its four-lane form against the scalar one bit for bit.
/// </summary>
public sealed class StepControlTests
{
    // Error norms log-uniform over the range the rule takes roots of, and exact powers of two (every residue of the
    // exponent modulo 5, where the root switches constants).
    private static readonly Gen<double> Norms = Gen.Frequency(
        (4, Gen.Double[Math.Log(1.8e-4), Math.Log(2000)].Select(Math.Exp)),
        (1, Gen.Int[-12, 10].Select(k => Math.ScaleB(1.0, k))));

    [Fact]
    public void InverseFifthRoot_AgreesWithThePlatformsPower_ToTheRulesTolerance()
    {
        Norms.Sample(e => Assert.InRange(Relative(StepControl.InverseFifthRoot(e), Math.Pow(e, -0.2)), 0, Tolerance.StepRule), iter: 100_000);
    }

    [Fact]
    public void Factors_AreTheRulesFormula_CappedAtBothEnds()
    {
        Norms.Where(e => e <= 1).Sample(e => Assert.InRange(Relative(StepControl.Growth(e), Math.Min(5.0, 0.9 * Math.Pow(e, -0.2))), 0, Tolerance.StepRule));
        Norms.Where(e => e > 1).Sample(e => Assert.InRange(Relative(StepControl.Shrinkage(e), Math.Max(0.2, 0.9 * Math.Pow(e, -0.2))), 0, Tolerance.StepRule));
        foreach (var e in new[] { 0, 1e-300, 1e-9, 1.8e-4 })
        {
            Assert.Equal(5.0, StepControl.Growth(e));
        }

        foreach (var e in new[] { 2000, 1e12, double.MaxValue })
        {
            Assert.Equal(0.2, StepControl.Shrinkage(e));
        }

        // Just inside the caps the formula itself reaches them: 0.9·(1.8e-4)^(−1/5) ≈ 5.05, 0.9·2000^(−1/5) ≈ 0.197.
        Assert.Equal(5.0, StepControl.Growth(Math.BitIncrement(1.8e-4)));
        Assert.Equal(0.2, StepControl.Shrinkage(Math.BitDecrement(2000)));
    }

    [Fact]
    public void Lanes_GiveTheScalarBits_WhateverTheirNeighbours()
    {
        double[] strange = [0, double.NaN, double.PositiveInfinity, -1, 1e-310, double.MaxValue];
        var lane = Gen.Frequency((6, Norms), (1, Gen.Int[0, strange.Length - 1].Select(i => strange[i])));
        Gen.Select(lane, lane, lane, lane).Sample(values =>
        {
            var e = Vector256.Create(values.Item1, values.Item2, values.Item3, values.Item4);
            var roots = StepControl.InverseFifthRoot(e);
            for (var j = 0; j < 4; j++)
            {
                var x = e.GetElement(j);
                if (x >= 1.8e-4 && x <= 2000)
                {
                    Assert.Equal(BitConverter.DoubleToInt64Bits(StepControl.InverseFifthRoot(x)), BitConverter.DoubleToInt64Bits(roots.GetElement(j)));
                }
            }
        }, iter: 20_000);
    }

    private static double Relative(double a, double b) => Math.Abs(a - b) / Math.Abs(b);
}
