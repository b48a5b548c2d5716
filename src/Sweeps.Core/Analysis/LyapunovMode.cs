namespace Sweeps.Core.Analysis;

public enum LyapunovMode
{
    /// <summary>The full spectrum by QR re-orthonormalisation of n tangent vectors.</summary>
    Spectrum,

    /// <summary>The largest exponent only, from one tangent vector.</summary>
    Largest,

    /// <summary>No tangent dynamics; classification rests on the period detector alone.</summary>
    None,
}
