namespace Sweeps.Core.Analysis;

/// <summary>
/// The starting tangent vectors of the QR method. The identity is a poor start: when the Jacobian
/// leaves a coordinate axis invariant (any triangular or decoupled model), the first vector never
/// leaves that axis and the largest exponent is missed. A fixed, generic orthonormal frame avoids
/// that and keeps every run deterministic.
/// </summary>
internal static class TangentFrame
{
    /// <summary>k orthonormal columns of length n, the same for every call with the same n and k.</summary>
    public static double[] Initial(int n, int k)
    {
        var frame = new double[n * k];
        var random = new Random(1_000_003 + n);
        for (var i = 0; i < frame.Length; i++)
        {
            frame[i] = random.NextDouble() - 0.5;
        }

        var norms = new double[Math.Max(k, 1)];
        Orthonormalizer.Orthonormalize(frame, n, k, norms);
        return frame;
    }
}
