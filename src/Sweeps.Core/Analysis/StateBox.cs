namespace Sweeps.Core.Analysis;

/// <summary>An axis-aligned box in state space: the lowest and highest value of each variable.</summary>
public sealed record StateBox(double[] Low, double[] High)
{
    /// <summary>The degenerate box of one state.</summary>
    public static StateBox Point(ReadOnlySpan<double> state) => new(state.ToArray(), state.ToArray());

    /// <summary>The smallest box holding every state (each of the box's dimension).</summary>
    public static StateBox Of(IReadOnlyList<double[]> states)
    {
        var low = states[0].ToArray();
        var high = states[0].ToArray();
        foreach (var state in states)
        {
            for (var j = 0; j < low.Length; j++)
            {
                low[j] = Math.Min(low[j], state[j]);
                high[j] = Math.Max(high[j], state[j]);
            }
        }

        return new StateBox(low, high);
    }
}
