using CsCheck;
using Sweeps.Engine.Runs.Columnar;

namespace Sweeps.Engine.Tests.Runs;

/// <summary>
/// A double column's statistics against the definition (Apache Parquet format, parquet.thrift, Statistics and
/// ColumnOrder): min_value and max_value over the values other than NaN, a zero minimum written −0 and a zero maximum
/// +0, none when every value is NaN.
/// </summary>
public sealed class ColumnStatisticsTests
{
    [Fact]
    public void Of_GivesTheRangeOfTheValuesOtherThanNaN_WhateverTheirNumberAndOrder()
    {
        // Lengths around the four-value vectors and their remainders; columns mostly or wholly NaN.
        var mostlyNaN = Gen.Frequency((12, Gen.Const(double.NaN)), (1, TestValues.Doubles));
        var columns = Gen.OneOf(TestValues.Doubles.Array[0, 70], mostlyNaN.Array[0, 40], Gen.Const(double.NaN).Array[0, 20]);
        Gen.Select(columns, Gen.Long[0, 5]).Sample((values, nulls) =>
        {
            var statistics = ColumnStatistics.Of(values, nulls);
            var ordered = values.Where(v => !double.IsNaN(v)).ToArray();

            Assert.Equal(nulls, statistics.Nulls);
            if (ordered.Length == 0)
            {
                Assert.Null(statistics.Min);
                Assert.Null(statistics.Max);
                return;
            }

            var (min, max) = (ordered.Min(), ordered.Max());
            Assert.Equal(BitConverter.GetBytes(min == 0 ? -0.0 : min), statistics.Min);
            Assert.Equal(BitConverter.GetBytes(max == 0 ? 0.0 : max), statistics.Max);
        });
    }
}
