namespace Sweeps.Core.Analysis;

/// <summary>The text forms of regimes used in every output: <c>fixed-point</c>, <c>periodic</c>, …</summary>
public static class RegimeNames
{
    private static readonly string[] Names =
        ["fixed-point", "periodic", "quasi-periodic", "chaotic", "hyperchaotic", "divergent", "unresolved"];

    public static IReadOnlyList<string> All => Names;

    public static string ToText(this Regime regime) => Names[(int)regime];

    public static bool TryParse(string text, out Regime regime)
    {
        var index = Array.IndexOf(Names, text);
        regime = index < 0 ? default : (Regime)index;
        return index >= 0;
    }
}
