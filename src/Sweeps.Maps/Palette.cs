using ScottPlot;

namespace Sweeps.Maps;

/// <summary>
/// Sweeps' own colours. Regimes are categorical and chosen to stay apart for the common colour-vision
/// deficiencies (they differ in lightness as well as hue); periods get an ordered run of distinct
/// colours with one bucket for longer cycles; exponents a diverging blue–white–red scale centred on zero.
/// </summary>
public static class Palette
{
    /// <summary>Periods 1 … <see cref="PeriodColors"/>.Length get their own colour; longer ones share <see cref="LongerPeriod"/>.</summary>
    public static readonly Color[] PeriodColors =
    [
        Color.FromHex("#1F5FA8"), Color.FromHex("#F0A33A"), Color.FromHex("#3FA78A"), Color.FromHex("#B8405E"),
        Color.FromHex("#8C6BC8"), Color.FromHex("#7FC3E8"), Color.FromHex("#C9B23A"), Color.FromHex("#5C3A21"),
    ];

    public static readonly Color LongerPeriod = Color.FromHex("#F2C6D3");

    public static readonly Color NoPeriod = Color.FromHex("#E4E4E4");

    public static readonly Color Unknown = Color.FromHex("#FFFFFF");

    public static Color ForRegime(string regime) => regime switch
    {
        "fixed-point" => Color.FromHex("#1F5FA8"),
        "periodic" => Color.FromHex("#F0A33A"),
        "quasi-periodic" => Color.FromHex("#3FA78A"),
        "chaotic" => Color.FromHex("#B8405E"),
        "hyperchaotic" => Color.FromHex("#5B2A86"),
        "divergent" => Color.FromHex("#2B2B2B"),
        "unresolved" => Color.FromHex("#BDBDBD"),
        _ => Unknown,
    };

    /// <summary>Attractors 1 … <see cref="AttractorColors"/>.Length get their own colour; further ones share <see cref="LongerPeriod"/>.</summary>
    public static readonly Color[] AttractorColors =
    [
        .. PeriodColors,
        Color.FromHex("#2E8B3E"), Color.FromHex("#E06A1B"), Color.FromHex("#4A4A9C"), Color.FromHex("#9DBF5A"),
    ];

    /// <summary>Label 0, 1, … as given by the run's attractor catalog; negative labels (beyond the catalog, or missing) are grey.</summary>
    public static Color ForAttractor(int label) =>
        label < 0 ? NoPeriod : label < AttractorColors.Length ? AttractorColors[label] : LongerPeriod;

    /// <summary>Continuation sweeps: the two branches of a bifurcation diagram and the strip marking where they differ.</summary>
    public static readonly Color ForwardBranch = Color.FromHex("#3B3B98");

    public static readonly Color BackwardBranch = Color.FromHex("#D95F02");

    public static readonly Color Hysteresis = Color.FromHex("#6B1E4F");

    public static Color ForPeriod(int period) =>
        period <= 0 ? NoPeriod : period <= PeriodColors.Length ? PeriodColors[period - 1] : LongerPeriod;

    /// <summary>The diverging scale for exponents, negative (blue) through zero (white) to positive (red).</summary>
    public static IColormap Exponents { get; } = new ScottPlot.Colormaps.CustomInterpolated(
        [Color.FromHex("#1F4E96"), Color.FromHex("#8FB4DC"), Color.FromHex("#F7F7F7"), Color.FromHex("#E39A8C"), Color.FromHex("#A3202F")]);
}
