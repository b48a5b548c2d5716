namespace Sweeps.Engine.Specs;

/// <summary>
/// One axis of a grid: <see cref="Steps"/> values from <see cref="From"/> to <see cref="To"/> (both
/// included), linearly or logarithmically spaced, or an explicit list of values. Values are computed
/// on demand, so an axis of any length costs nothing to describe.
/// </summary>
public sealed record GridAxis(
    string Name,
    AxisTarget Target,
    int Slot,
    double From,
    double To,
    long Steps,
    AxisSpacing Spacing = AxisSpacing.Linear,
    IReadOnlyList<double>? Values = null)
{
    public long Count => Values?.Count ?? Steps;

    /// <summary>The i-th value; the first is exactly <see cref="From"/> and the last exactly <see cref="To"/>.</summary>
    public double ValueAt(long i)
    {
        if (Values is not null)
        {
            return Values[(int)i];
        }

        if (Steps == 1 || i == 0)
        {
            return From;
        }

        if (i == Steps - 1)
        {
            return To;
        }

        var fraction = (double)i / (Steps - 1);
        return Spacing == AxisSpacing.Log
            ? Math.Exp(Math.Log(From) + ((Math.Log(To) - Math.Log(From)) * fraction))
            : From + ((To - From) * fraction);
    }
}
