using CsCheck;
using Sweeps.Core.Analysis;

namespace Sweeps.Core.Tests.Analysis;

/// <summary>The unrolled two-by-two QR step against the general loop it shortcuts: the same bits in every case.</summary>
public sealed class OrthonormalizerTests
{
    // Components drawn from a few magnitudes, exact zeros and non-finite values, so collapsed and broken frames occur.
    private static readonly Gen<double> Component = Gen.OneOf(
        Gen.Double[-10, 10],
        Gen.Double[-1e-150, 1e-150],
        Gen.Const(0.0),
        Gen.Const(-0.0),
        Gen.Const(double.PositiveInfinity),
        Gen.Const(double.NaN));

    [Fact]
    public void TwoByTwo_GivesTheGeneralLoopsBits_ForAnyFrame()
    {
        Gen.Select(Component, Component, Component, Component).Sample((a0, a1, b0, b1) =>
        {
            double[] fast = [a0, a1, b0, b1], plain = [a0, a1, b0, b1];
            double[] fastNorms = new double[2], plainNorms = new double[2];
            var fastOk = Orthonormalizer.Orthonormalize(fast, 2, 2, fastNorms);
            var plainOk = Orthonormalizer.OrthonormalizeGeneral(plain, 2, 2, plainNorms);
            Assert.Equal(plainOk, fastOk);
            if (plainOk)
            {
                Assert.Equal(Bits(plain), Bits(fast));
                Assert.Equal(Bits(plainNorms), Bits(fastNorms));
            }
        }, iter: 20_000);
    }

    private static long[] Bits(double[] values) => values.Select(BitConverter.DoubleToInt64Bits).ToArray();
}
