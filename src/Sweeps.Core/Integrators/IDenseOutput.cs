namespace Sweeps.Core.Integrators;

/// <summary>The solution inside the last step taken: where section crossings are located.</summary>
internal interface IDenseOutput
{
    /// <summary>Time at the start of the step.</summary>
    double StartTime { get; }

    /// <summary>Time at the end of the step.</summary>
    double EndTime { get; }

    /// <summary>The solution at StartTime + θ·(EndTime − StartTime), θ ∈ [0, 1], into <paramref name="output"/> (first <paramref name="count"/> entries).</summary>
    void Interpolate(double theta, double[] output, int count);
}
