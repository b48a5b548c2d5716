namespace Sweeps.Engine.Config;

/// <summary>A 1-based line and column in a config file.</summary>
public readonly record struct SourcePosition(int Line, int Column)
{
    public override string ToString() => $"{Line}:{Column}";
}
