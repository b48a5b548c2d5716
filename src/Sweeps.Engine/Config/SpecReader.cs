using Sweeps.Core.Models;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Config;

/// <summary>
/// Reads a TOML config into a validated <see cref="SweepSpec"/>, or throws a
/// <see cref="ConfigException"/> listing every problem with file, line and column.
/// </summary>
public static partial class SpecReader
{
    private static readonly string[] Sections = ["model", "initial", "parameters", "grid", "analysis", "integrator", "section", "starts", "output"];

    public static SweepSpec Load(string path)
    {
        string text;
        try
        {
            text = System.IO.File.ReadAllText(path);
        }
        catch (Exception error) when (error is IOException or UnauthorizedAccessException)
        {
            throw ConfigException.Single(path, $"cannot read config: {error.Message}");
        }

        return Parse(text, path);
    }

    public static SweepSpec Parse(string text, string file)
    {
        var reader = new ConfigReader(file);
        var root = TomlReader.Read(text, file, reader.Problems);
        if (reader.Problems.Count > 0)
        {
            throw new ConfigException(reader.Problems);
        }

        reader.OnlyKeys(root, Sections);
        var model = ReadModel(reader, root);
        var grid = model is null ? null : ReadGrid(reader, root, model);
        var swept = SweptNames(root);
        // Variables drawn from [starts] need no [initial] value (one given there is simply not used).
        var drawn = root.Find("starts")?.Value is ConfigTable startTable ? startTable.Entries.Select(e => e.Key).ToHashSet(StringComparer.Ordinal) : [];
        var initial = model is null ? null : ReadValues(reader, root, "initial", model.Variables, grid, swept, AxisTarget.Variable, drawn);
        var parameters = model is null ? null : ReadValues(reader, root, "parameters", model.Parameters, grid, swept, AxisTarget.Parameter);
        var analysis = ReadAnalysis(reader, root, model?.Kind ?? ModelKind.Map);
        var integrator = ReadIntegrator(reader, root);
        var section = ReadSection(reader, root, model);
        var starts = model is null || grid is null ? null : ReadStarts(reader, root, model, grid);
        var (output, chunkSize) = ReadOutput(reader, root);
        if (reader.Problems.Count > 0 || model is null || grid is null || initial is null || parameters is null)
        {
            throw new ConfigException(reader.Problems);
        }

        return new SweepSpec(file, model, initial, parameters, grid, analysis, integrator, output, chunkSize, section, starts);
    }

    private static (string? Dir, long? ChunkSize) ReadOutput(ConfigReader reader, ConfigTable root)
    {
        var table = reader.Table(root, "output", required: false);
        if (table is null)
        {
            return (null, null);
        }

        reader.OnlyKeys(table, "dir", "chunk_size");
        var chunkSize = reader.Integer(table, "chunk_size", 1, Planning.ChunkPlan.MaxChunk);
        var dir = reader.String(table, "dir", required: false);
        if (dir is { Length: 0 })
        {
            reader.Problem(table.Find("dir")!.Value.Position, "output.dir: must not be empty");
        }

        return (dir, chunkSize);
    }

    /// <summary>
    /// Reads [initial] or [parameters]: every name must be a model name, and every model name not swept
    /// by the grid needs a value. Swept names start at their axis' first value.
    /// </summary>
    /// <summary>Names written in [grid], valid or not: a broken axis is reported once, not again as a missing value.</summary>
    private static HashSet<string> SweptNames(ConfigTable root) =>
        root.Find("grid")?.Value is ConfigTable grid ? grid.Entries.Select(e => e.Key).ToHashSet(StringComparer.Ordinal) : [];

    private static double[]? ReadValues(
        ConfigReader reader, ConfigTable root, string section, IReadOnlyList<string> names, Grid? grid, HashSet<string> swept, AxisTarget target, HashSet<string>? drawn = null)
    {
        var table = reader.Table(root, section, required: false) ?? new ConfigTable(section, new SourcePosition(1, 1));
        var values = new double[names.Count];
        var known = new bool[names.Count];
        foreach (var entry in table.Entries)
        {
            var slot = IndexOf(names, entry.Key);
            if (slot < 0)
            {
                var kind = target == AxisTarget.Variable ? "variable" : "parameter";
                var suggestion = Core.Expressions.NameSuggester.Closest(entry.Key, names);
                var hint = suggestion is null ? $" ({kind}s: {List(names)})" : $" (did you mean '{suggestion}'?)";
                reader.Problem(entry.KeyPosition, $"{section}.{entry.Key}: '{entry.Key}' is not a {kind} of the model{hint}");
                continue;
            }

            if (swept.Contains(entry.Key))
            {
                reader.Problem(entry.KeyPosition, $"{section}.{entry.Key}: '{entry.Key}' is also swept in [grid]; keep one of the two");
                continue;
            }

            if (reader.Number(entry.Value, $"{section}.{entry.Key}", _ => true, "") is { } value)
            {
                values[slot] = value;
                known[slot] = true;
            }
        }

        for (var i = 0; i < names.Count; i++)
        {
            if (known[i])
            {
                continue;
            }

            if (grid?.Axes.FirstOrDefault(a => a.Name == names[i]) is { } axis)
            {
                values[i] = axis.ValueAt(0);
            }
            else if (table.Find(names[i]) is null && !swept.Contains(names[i]) && drawn?.Contains(names[i]) != true)
            {
                reader.Problem(table.Position, $"{section}: no value for '{names[i]}' (give one here or sweep it in [grid])");
            }
        }

        return values;
    }

    private static int IndexOf(IReadOnlyList<string> names, string name)
    {
        for (var i = 0; i < names.Count; i++)
        {
            if (names[i] == name)
            {
                return i;
            }
        }

        return -1;
    }

    private static string List(IEnumerable<string> names) => string.Join(", ", names);
}
