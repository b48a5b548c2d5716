using CsCheck;

namespace Sweeps.Engine.Tests.Runs;

/// <summary>Generators of column values for the part writer's tests.</summary>
internal static class TestValues
{
    /// <summary>Any double, with the values a writer must treat apart weighed in: NaN, ±∞, ±0, the smallest subnormal, the lowest.</summary>
    public static readonly Gen<double> Doubles = Gen.Frequency(
        (6, Gen.Double),
        (1, Gen.OneOf(double.NaN, double.PositiveInfinity, double.NegativeInfinity, 0.0, -0.0, double.Epsilon, -double.MaxValue)));
}
