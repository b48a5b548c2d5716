namespace Sweeps.Maps;

/// <summary>What to draw: the colouring, the fixed values of axes beyond the two drawn, and the image size in pixels.</summary>
public sealed record MapRequest(ColorMode Color, IReadOnlyDictionary<string, double> Slices, int Width = 1000, int Height = 700);
