using Sweeps.Core.Expressions;

namespace Sweeps.Engine.Config;

/// <summary>
/// Typed, checked access to the values of a config. Every failed check records a problem at the
/// value's position and returns a fallback, so one pass reports all problems at once.
/// </summary>
internal sealed class ConfigReader(string file)
{
    public List<ConfigProblem> Problems { get; } = [];

    public string File => file;

    public void Problem(SourcePosition? position, string message) => Problems.Add(new ConfigProblem(file, position, message));

    /// <summary>Reports every key of <paramref name="table"/> not in <paramref name="allowed"/>, with a suggestion.</summary>
    public void OnlyKeys(ConfigTable table, params string[] allowed)
    {
        foreach (var entry in table.Entries)
        {
            if (Array.IndexOf(allowed, entry.Key) >= 0)
            {
                continue;
            }

            var suggestion = NameSuggester.Closest(entry.Key, allowed);
            var hint = suggestion is null ? $" (known: {string.Join(", ", allowed)})" : $" (did you mean '{suggestion}'?)";
            Problem(entry.KeyPosition, $"{table.Name(entry.Key)}: unknown key{hint}");
        }
    }

    public ConfigTable? Table(ConfigTable parent, string key, bool required)
    {
        var entry = parent.Find(key);
        if (entry is null)
        {
            if (required)
            {
                Problem(null, $"missing [{parent.Name(key)}] table");
            }

            return null;
        }

        if (entry.Value is ConfigTable table)
        {
            return table;
        }

        Problem(entry.Value.Position, $"{parent.Name(key)}: must be a table, not {entry.Value.TypeName}");
        return null;
    }

    public string? String(ConfigTable table, string key, bool required, params string[] choices)
    {
        var entry = table.Find(key);
        if (entry is null)
        {
            if (required)
            {
                Problem(table.Position, $"{table.Name(key)}: missing (required)");
            }

            return null;
        }

        if (entry.Value is not ConfigScalar { Value: string text })
        {
            Problem(entry.Value.Position, $"{table.Name(key)}: must be a string, not {entry.Value.TypeName}");
            return null;
        }

        if (choices.Length > 0 && Array.IndexOf(choices, text) < 0)
        {
            var options = string.Join(", ", choices.Select(c => $"\"{c}\""));
            Problem(entry.Value.Position, $"{table.Name(key)}: \"{text}\" is not one of {options}");
            return null;
        }

        return text;
    }

    public double? Number(ConfigTable table, string key, Func<double, bool> valid, string rule)
    {
        var entry = table.Find(key);
        return entry is null ? null : Number(entry.Value, table.Name(key), valid, rule);
    }

    public double? Number(ConfigValue value, string name, Func<double, bool> valid, string rule)
    {
        var number = value switch
        {
            ConfigScalar { Value: double real } => real,
            ConfigScalar { Value: long integer } => integer,
            _ => (double?)null,
        };
        if (number is not { } x)
        {
            Problem(value.Position, $"{name}: must be a number, not {value.TypeName}");
            return null;
        }

        if (!double.IsFinite(x))
        {
            Problem(value.Position, $"{name}: must be finite, not {(double.IsNaN(x) ? "nan" : x > 0 ? "inf" : "-inf")}");
            return null;
        }

        if (!valid(x))
        {
            Problem(value.Position, $"{name}: {x} is out of range ({rule})");
            return null;
        }

        return x;
    }

    public bool? Boolean(ConfigTable table, string key)
    {
        var entry = table.Find(key);
        if (entry is null)
        {
            return null;
        }

        if (entry.Value is ConfigScalar { Value: bool value })
        {
            return value;
        }

        Problem(entry.Value.Position, $"{table.Name(key)}: must be true or false, not {entry.Value.TypeName}");
        return null;
    }

    public long? Integer(ConfigTable table, string key, long min, long max)
    {
        var entry = table.Find(key);
        if (entry is null)
        {
            return null;
        }

        if (entry.Value is not ConfigScalar { Value: long value })
        {
            var what = entry.Value is ConfigScalar { Value: double } ? "a float (write it without a decimal point)" : entry.Value.TypeName;
            Problem(entry.Value.Position, $"{table.Name(key)}: must be an integer, not {what}");
            return null;
        }

        if (value < min || value > max)
        {
            Problem(entry.Value.Position, $"{table.Name(key)}: {value} is out of range ({min} to {max})");
            return null;
        }

        return value;
    }

    public List<(string Name, SourcePosition Position)>? Names(ConfigTable table, string key, bool required)
    {
        var entry = table.Find(key);
        if (entry is null)
        {
            if (required)
            {
                Problem(table.Position, $"{table.Name(key)}: missing (required)");
            }

            return null;
        }

        if (entry.Value is not ConfigArray array)
        {
            Problem(entry.Value.Position, $"{table.Name(key)}: must be an array of names, not {entry.Value.TypeName}");
            return null;
        }

        var names = new List<(string, SourcePosition)>();
        foreach (var item in array.Items)
        {
            if (item is ConfigScalar { Value: string name })
            {
                names.Add((name, item.Position));
            }
            else
            {
                Problem(item.Position, $"{table.Name(key)}: each entry must be a string name, not {item.TypeName}");
            }
        }

        return names;
    }
}
