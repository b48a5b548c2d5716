namespace Sweeps.Engine.Specs;

/// <summary>
/// The Cartesian product of the axes, indexed row-major: the first axis varies slowest and the last
/// fastest, as in a C array. A grid with no axes has exactly one point.
/// </summary>
public sealed record Grid(IReadOnlyList<GridAxis> Axes)
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
}
