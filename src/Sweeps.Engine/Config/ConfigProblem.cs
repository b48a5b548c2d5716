namespace Sweeps.Engine.Config;

/// <summary>One problem in a config, located where it was written: <c>file:line:col: message</c>.</summary>
public sealed record ConfigProblem(string File, SourcePosition? Position, string Message)
{
    public override string ToString() => Position is { } at ? $"{File}:{at}: {Message}" : $"{File}: {Message}";
}
