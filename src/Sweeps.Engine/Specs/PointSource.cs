namespace Sweeps.Engine.Specs;

/// <summary>
/// Turns point indices into the initial state and parameters to analyse: the spec's base values with
/// the swept slots overwritten by the point's grid coordinates. It owns the buffers it fills (reused
/// for every point, no allocation); one per thread.
/// </summary>
public sealed class PointSource
{
    private readonly double[] baseInitial;
    private readonly double[] baseParameters;
    private readonly Grid grid;
    private readonly GridAxis[] axes;

    public PointSource(SweepSpec spec)
    {
        baseInitial = spec.Initial.ToArray();
        baseParameters = spec.Parameters.ToArray();
        grid = spec.Grid;
        axes = spec.Grid.Axes.ToArray();
        Initial = new double[baseInitial.Length];
        Parameters = new double[baseParameters.Length];
        AxisValues = new double[axes.Length];
    }

    public double[] Initial { get; }

    public double[] Parameters { get; }

    /// <summary>The point's coordinate on each grid axis, in axis order.</summary>
    public double[] AxisValues { get; }

    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public void Fill(long point)
    {
        baseInitial.CopyTo(Initial, 0);
        baseParameters.CopyTo(Parameters, 0);
        grid.Apply(point, Initial, Parameters);
        for (var a = 0; a < axes.Length; a++)
        {
            AxisValues[a] = (axes[a].Target == AxisTarget.Parameter ? Parameters : Initial)[axes[a].Slot];
        }
    }
}
