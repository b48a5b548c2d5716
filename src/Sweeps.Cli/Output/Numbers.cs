using System.Globalization;
using System.Numerics;

namespace Sweeps.Cli.Output;

/// <summary>Number formatting for text output: invariant culture, 6 significant digits, inf/nan spelt out.</summary>
internal static class Numbers
{
    public static string Format(double value, string format = "g6") => value switch
    {
        double.PositiveInfinity => "inf",
        double.NegativeInfinity => "-inf",
        _ when double.IsNaN(value) => "nan",
        _ => (value == 0 ? 0.0 : value).ToString(format, CultureInfo.InvariantCulture),
    };

    public static string Format(Complex value)
    {
        if (Math.Abs(value.Imaginary) <= 1e-12 * Math.Max(1, value.Magnitude))
        {
            return Format(value.Real);
        }

        var sign = value.Imaginary < 0 ? "-" : "+";
        return $"{Format(value.Real)}{sign}{Format(Math.Abs(value.Imaginary))}i";
    }

    public static string Assignments(IReadOnlyList<string> names, IReadOnlyList<double> values) =>
        string.Join(", ", names.Select((name, i) => $"{name} = {Format(values[i], "R")}"));
}
