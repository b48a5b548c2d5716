using Sweeps.Core.Analysis;

namespace Sweeps.Engine.Runs;

/// <summary>Regimes in their contract order (fixed-point first), for legends and reports.</summary>
public static class RegimeOrder
{
    public static IEnumerable<string> Sort(IEnumerable<string> regimes) =>
        regimes.OrderBy(r => RegimeNames.TryParse(r, out var regime) ? (int)regime : int.MaxValue).ThenBy(r => r, StringComparer.Ordinal);
}
