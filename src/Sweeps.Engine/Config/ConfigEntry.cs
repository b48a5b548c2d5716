namespace Sweeps.Engine.Config;

/// <summary>A key of a table with its value and the position of the key.</summary>
internal sealed record ConfigEntry(string Key, SourcePosition KeyPosition, ConfigValue Value);
