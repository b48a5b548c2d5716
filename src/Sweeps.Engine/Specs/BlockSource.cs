namespace Sweeps.Engine.Specs;

/// <summary>
/// A block of points for an <see cref="Core.Kernels.IBlockAnalyzer"/>: per lane, the point index, its initial
/// state, parameters and axis values, filled from a <see cref="PointSource"/> into buffers reused for every
/// block (the analyzer keeps nothing of them). One per thread.
/// </summary>
public sealed class BlockSource
{
    private readonly PointSource source;

    public BlockSource(SweepSpec spec, int size)
    {
        source = new PointSource(spec);
        Points = new long[size];
        Initial = Lanes(size, spec.Initial.Count);
        Parameters = Lanes(size, spec.Parameters.Count);
        AxisValues = Lanes(size, spec.Grid.Axes.Count);
    }

    public long[] Points { get; }

    public double[][] Initial { get; }

    public double[][] Parameters { get; }

    public double[][] AxisValues { get; }

    /// <summary>Fills lanes 0 … <paramref name="lanes"/> − 1 with the points <paramref name="pointAt"/> names for <paramref name="offset"/> + lane.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public void Fill(int lanes, Func<int, long> pointAt, int offset = 0)
    {
        for (var j = 0; j < lanes; j++)
        {
            Points[j] = pointAt(offset + j);
            source.Fill(Points[j]);
            source.Initial.CopyTo(Initial[j], 0);
            source.Parameters.CopyTo(Parameters[j], 0);
            source.AxisValues.CopyTo(AxisValues[j], 0);
        }
    }

    private static double[][] Lanes(int lanes, int length) => Enumerable.Range(0, lanes).Select(_ => new double[length]).ToArray();
}
