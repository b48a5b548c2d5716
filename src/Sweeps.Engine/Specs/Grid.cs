namespace Sweeps.Engine.Specs;

/// <summary>
/// The Cartesian product of the axes, indexed row-major: the first axis varies slowest and the last
/// fastest, as in a C array. A grid with no axes has exactly one point. With <see cref="Follow"/> set,
/// the grid is also a set of lines along that axis (a continuation sweep runs each line in order): line
/// ℓ holds the points whose other coordinates are the ℓ-th combination, row-major over the other axes.
/// </summary>
/// <param name="Axes">The axes, slowest first.</param>
/// <param name="Follow">Index of the axis continuation sweeps follow, if any.</param>
public sealed record Grid(IReadOnlyList<GridAxis> Axes, int? Follow = null)
{
    /// <summary>Largest grid Sweeps accepts; far beyond any overnight run, small enough for an int64 index.</summary>
    public const long MaxPoints = 1_000_000_000_000;

    public long PointCount => Axes.Aggregate(1L, (total, axis) => total * axis.Count);

    /// <summary>Writes the per-axis indices of a point index (row-major).</summary>
    public void Indices(long point, Span<long> indices)
    {
        for (var a = Axes.Count - 1; a >= 0; a--)
        {
            indices[a] = point % Axes[a].Count;
            point /= Axes[a].Count;
        }
    }

    /// <summary>The point index of per-axis indices (row-major); the inverse of <see cref="Indices"/>.</summary>
    public long PointIndex(ReadOnlySpan<long> indices)
    {
        var point = 0L;
        for (var a = 0; a < Axes.Count; a++)
        {
            point = (point * Axes[a].Count) + indices[a];
        }

        return point;
    }

    /// <summary>Overwrites the swept slots of <paramref name="initial"/> and <paramref name="parameters"/> with the point's coordinates.</summary>
    public void Apply(long point, double[] initial, double[] parameters)
    {
        for (var a = Axes.Count - 1; a >= 0; a--)
        {
            var axis = Axes[a];
            var value = axis.ValueAt(point % axis.Count);
            point /= axis.Count;
            (axis.Target == AxisTarget.Parameter ? parameters : initial)[axis.Slot] = value;
        }
    }

    /// <summary>Points per line: the followed axis' length (1 without one).</summary>
    public long LineLength => Follow is { } f ? Axes[f].Count : 1;

    public long LineCount => PointCount / LineLength;

    /// <summary>
    /// Where a point comes when the grid is walked line by line: line × <see cref="LineLength"/> + step, the inverse of
    /// <see cref="LinePoint"/> (the point index itself without a followed axis).
    /// </summary>
    public long LineOrder(long point)
    {
        if (Follow is not { } follow)
        {
            return point;
        }

        Span<long> indices = stackalloc long[Axes.Count];
        Indices(point, indices);
        var line = 0L;
        for (var a = 0; a < Axes.Count; a++)
        {
            line = a == follow ? line : (line * Axes[a].Count) + indices[a];
        }

        return (line * Axes[follow].Count) + indices[follow];
    }

    /// <summary>The point index of the <paramref name="step"/>-th point of line <paramref name="line"/>.</summary>
    public long LinePoint(long line, long step)
    {
        if (Follow is not { } follow)
        {
            return line;
        }

        var rest = line;
        Span<long> indices = stackalloc long[Axes.Count];
        for (var a = Axes.Count - 1; a >= 0; a--)
        {
            if (a == follow)
            {
                continue;
            }

            indices[a] = rest % Axes[a].Count;
            rest /= Axes[a].Count;
        }

        indices[follow] = step;
        return PointIndex(indices);
    }
}
