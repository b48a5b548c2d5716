using Tomlyn.Parsing;
using Tomlyn.Syntax;

namespace Sweeps.Engine.Config;

/// <summary>
/// Reads TOML text into <see cref="ConfigTable"/>s with the position of every key and value, using
/// Tomlyn's syntax tree. We walk the tree ourselves rather than deserialising into records because
/// the deserialiser ignores unknown keys and drops positions, and both matter for our error lines.
/// </summary>
internal static class TomlReader
{
    public static ConfigTable Read(string text, string file, List<ConfigProblem> problems)
    {
        var document = SyntaxParser.Parse(text, file, validate: true);
        var root = new ConfigTable("", new SourcePosition(1, 1));
        if (document.HasErrors)
        {
            // Only the earliest syntax error: the ones after it mostly follow from it.
            var first = document.Diagnostics
                .Where(d => d.Kind == DiagnosticMessageKind.Error)
                .OrderBy(d => d.Span.Start.Line)
                .ThenBy(d => d.Span.Start.Column)
                .First();
            problems.Add(new ConfigProblem(file, At(first.Span.Start), $"TOML syntax: {first.Message}"));
            return root;
        }

        foreach (var keyValue in document.KeyValues)
        {
            AddKeyValue(root, keyValue, problems, file);
        }

        foreach (var table in document.Tables)
        {
            if (table is TableArraySyntax)
            {
                problems.Add(new ConfigProblem(file, At(table.Span.Start), "arrays of tables ([[...]]) are not used in Sweeps configs"));
                continue;
            }

            var target = root;
            foreach (var (part, _) in KeyParts(table.Name!))
            {
                target = Subtable(target, part, At(table.Span.Start));
            }

            foreach (var keyValue in table.Items)
            {
                AddKeyValue(target, keyValue, problems, file);
            }
        }

        return root;
    }

    private static void AddKeyValue(ConfigTable table, KeyValueSyntax keyValue, List<ConfigProblem> problems, string file)
    {
        var parts = KeyParts(keyValue.Key!).ToList();
        var target = table;
        for (var i = 0; i < parts.Count - 1; i++)
        {
            target = Subtable(target, parts[i].Name, parts[i].Position);
        }

        var (key, position) = parts[^1];
        if (Convert(keyValue.Value!, target.Name(key), problems, file) is { } value)
        {
            target.Add(new ConfigEntry(key, position, value));
        }
    }

    private static ConfigTable Subtable(ConfigTable parent, string name, SourcePosition position)
    {
        if (parent.Find(name)?.Value is ConfigTable existing)
        {
            return existing;
        }

        var created = new ConfigTable(parent.Name(name), position);
        parent.Add(new ConfigEntry(name, position, created));
        return created;
    }

    private static ConfigValue? Convert(ValueSyntax syntax, string path, List<ConfigProblem> problems, string file)
    {
        var position = At(syntax.Span.Start);
        switch (syntax)
        {
            case StringValueSyntax text:
                return new ConfigScalar(text.Value ?? "", position);
            case IntegerValueSyntax integer:
                return new ConfigScalar(integer.Value, position);
            case FloatValueSyntax real:
                return new ConfigScalar(real.Value, position);
            case BooleanValueSyntax boolean:
                return new ConfigScalar(boolean.Value, position);
            case ArraySyntax array:
                var items = new List<ConfigValue>();
                foreach (var item in array.Items)
                {
                    if (Convert(item.Value!, path, problems, file) is { } value)
                    {
                        items.Add(value);
                    }
                }

                return new ConfigArray(items, position);
            case InlineTableSyntax inline:
                var table = new ConfigTable(path, position);
                foreach (var item in inline.Items)
                {
                    AddKeyValue(table, item.KeyValue!, problems, file);
                }

                return table;
            default:
                problems.Add(new ConfigProblem(file, position, $"{path}: dates and times are not used in Sweeps configs"));
                return null;
        }
    }

    private static IEnumerable<(string Name, SourcePosition Position)> KeyParts(KeySyntax key)
    {
        yield return (KeyText(key.Key!), At(key.Key!.Span.Start));
        foreach (var dotted in key.DotKeys)
        {
            yield return (KeyText(dotted.Key!), At(dotted.Key!.Span.Start));
        }
    }

    private static string KeyText(BareKeyOrStringValueSyntax key) => key switch
    {
        BareKeySyntax bare => bare.Key!.Text!,
        StringValueSyntax quoted => quoted.Value ?? "",
        _ => key.ToString()!.Trim(),
    };

    /// <summary>Tomlyn positions are zero-based; ours are 1-based like every editor's.</summary>
    internal static SourcePosition At(TextPosition position) => new(position.Line + 1, position.Column + 1);
}
