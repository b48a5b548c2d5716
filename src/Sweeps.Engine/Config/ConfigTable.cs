namespace Sweeps.Engine.Config;

/// <summary>A TOML table (or inline table) that keeps the order and positions of its keys.</summary>
internal sealed record ConfigTable(string Path, SourcePosition Position) : ConfigValue(Position)
{
    private readonly List<ConfigEntry> entries = [];

    public override string TypeName => "a table";

    public IReadOnlyList<ConfigEntry> Entries => entries;

    public ConfigEntry? Find(string key) => entries.Find(e => e.Key == key);

    public void Add(ConfigEntry entry) => entries.Add(entry);

    /// <summary>The dotted name of a key of this table, as used in messages: "analysis.measure".</summary>
    public string Name(string key) => Path.Length == 0 ? key : $"{Path}.{key}";
}
