namespace Sweeps.Engine.Config;

internal sealed record ConfigArray(IReadOnlyList<ConfigValue> Items, SourcePosition Position) : ConfigValue(Position)
{
    public override string TypeName => "an array";
}
