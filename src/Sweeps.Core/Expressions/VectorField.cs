namespace Sweeps.Core.Expressions;

/// <summary>
/// A compiled set of expressions: writes one value per expression into <paramref name="result"/>.
/// Arrays rather than spans because expression trees cannot take ref-struct parameters; callers own
/// and reuse the buffers, so a call allocates nothing.
/// </summary>
public delegate void VectorField(double[] x, double[] p, double t, double[] result);
