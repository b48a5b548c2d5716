using System.Runtime.Intrinsics;
using CsCheck;
using Sweeps.Core.Expressions;

namespace Sweeps.Core.Tests.Expressions;

/// <summary>
/// The model language's sine and cosine against the platform's routines (glibc's, correctly rounded in practice — an
/// independent implementation), against exact identities of the functions, and lane against scalar bit for bit.
/// </summary>
public sealed class TrigonometryTests
{
    [Fact]
    public void SinAndCos_AreWithinOneUlpOfThePlatform_OverTheWholeReducedRange()
    {
        // Random arguments on scales from 1e-8 to the reduction limit, and arguments next to multiples of π/2, where the
        // reduction cancels most (fdlibm's kernels are documented to stay below one unit in the last place).
        var random = new Random(20261202);
        var worst = 0L;
        for (var i = 0; i < 400_000; i++)
        {
            var scale = Math.Pow(10, -8 + (random.NextDouble() * 13.9));
            var x = (random.NextDouble() - 0.5) * 2 * Math.Min(scale, Trigonometry.Limit);
            worst = Math.Max(worst, Math.Max(Tolerance.Ulps(Trigonometry.Sin(x), Math.Sin(x)), Tolerance.Ulps(Trigonometry.Cos(x), Math.Cos(x))));
        }

        for (var k = 1L; k < 1 << 19; k = (k * 3) + 1)
        {
            var multiple = k * (Math.PI / 2);
            for (var step = -3; step <= 3; step++)
            {
                var x = Nudge(multiple, step);
                worst = Math.Max(worst, Math.Max(Tolerance.Ulps(Trigonometry.Sin(x), Math.Sin(x)), Tolerance.Ulps(Trigonometry.Cos(x), Math.Cos(x))));
            }
        }

        Assert.True(worst <= Tolerance.PlatformUlps, $"worst difference {worst} units in the last place");
    }

    [Fact]
    public void SinAndCos_KeepTheirSymmetriesAndExactValues()
    {
        // Exact identities: sin is odd, cos even; sin(±0) = ±0, cos(0) = 1; beyond the limit and for non-finite
        // arguments the platform's values.
        Gen.Double[-1e6, 1e6].Sample(x =>
        {
            Assert.Equal(BitConverter.DoubleToInt64Bits(-Trigonometry.Sin(x)), BitConverter.DoubleToInt64Bits(Trigonometry.Sin(-x)));
            Assert.Equal(BitConverter.DoubleToInt64Bits(Trigonometry.Cos(x)), BitConverter.DoubleToInt64Bits(Trigonometry.Cos(-x)));
        });
        Assert.Equal(BitConverter.DoubleToInt64Bits(-0.0), BitConverter.DoubleToInt64Bits(Trigonometry.Sin(-0.0)));
        Assert.Equal(0.0, Trigonometry.Sin(0.0));
        Assert.Equal(1.0, Trigonometry.Cos(0.0));
        Assert.Equal(1.0, Trigonometry.Cos(1e-9));
        // 2^19·π/2 = 823 549.66…: past it the quotient by π/2 needs more than 20 bits and the three-piece reduction loses exactness.
        var beyond = Gen.Double[823_549.7, 1e10].Select(Gen.Bool, (x, negative) => negative ? -x : x);
        beyond.Sample(x => Assert.Equal(BitConverter.DoubleToInt64Bits(Math.Sin(x)) ^ BitConverter.DoubleToInt64Bits(Math.Cos(x)), BitConverter.DoubleToInt64Bits(Trigonometry.Sin(x)) ^ BitConverter.DoubleToInt64Bits(Trigonometry.Cos(x))));
        foreach (var x in new[] { double.NaN, double.PositiveInfinity, double.NegativeInfinity, 1e6, -3e15, 1e300 })
        {
            Assert.Equal(Math.Sin(x), Trigonometry.Sin(x));
            Assert.Equal(Math.Cos(x), Trigonometry.Cos(x));
        }
    }

    [Fact]
    public void Lanes_GiveTheScalarBits_WhateverTheirNeighbours()
    {
        // Each lane from its own value alone: mixed scales, signed zeros, subnormals, values beyond the limit, infinities
        // and NaN side by side.
        double[] specials = [0.0, -0.0, double.Epsilon, -1e-310, double.NaN, double.PositiveInfinity, double.NegativeInfinity, 1e7, -2e12, Trigonometry.Limit, Math.PI / 4, 0.3, 0.78125];
        var special = Gen.Int[0, specials.Length - 1].Select(i => specials[i]);
        var ordinary = Gen.Double[-1, 1].Select(Gen.Int[-9, 6], (m, e) => m * Math.Pow(10, e));
        var lane = Gen.Frequency((3, ordinary), (1, special));
        Gen.Select(lane, lane, lane, lane).Sample(values =>
        {
            var x = Vector256.Create(values.Item1, values.Item2, values.Item3, values.Item4);
            var (sin, cos) = (Trigonometry.Sin(x), Trigonometry.Cos(x));
            for (var j = 0; j < 4; j++)
            {
                Assert.Equal(BitConverter.DoubleToInt64Bits(Trigonometry.Sin(x.GetElement(j))), BitConverter.DoubleToInt64Bits(sin.GetElement(j)));
                Assert.Equal(BitConverter.DoubleToInt64Bits(Trigonometry.Cos(x.GetElement(j))), BitConverter.DoubleToInt64Bits(cos.GetElement(j)));
            }
        }, iter: 20_000);
    }

    private static double Nudge(double x, int steps)
    {
        for (var i = 0; i < Math.Abs(steps); i++)
        {
            x = steps < 0 ? Math.BitDecrement(x) : Math.BitIncrement(x);
        }

        return x;
    }
}
