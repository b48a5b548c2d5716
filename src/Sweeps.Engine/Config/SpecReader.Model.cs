using Sweeps.Core.Expressions;
using Sweeps.Core.Models;

namespace Sweeps.Engine.Config;

public static partial class SpecReader
{
    private static ModelSource? ReadModel(ConfigReader reader, ConfigTable root)
    {
        var table = reader.Table(root, "model", required: true);
        if (table is null)
        {
            return null;
        }

        reader.OnlyKeys(table, "kind", "variables", "parameters", "equations", "forcing_period");
        var kindText = reader.String(table, "kind", required: true, "map", "flow");

        var before = reader.Problems.Count;
        var variables = reader.Names(table, "variables", required: true) ?? [];
        var parameters = reader.Names(table, "parameters", required: false) ?? [];
        if (table.Find("variables") is { } declared && variables.Count == 0 && declared.Value is ConfigArray)
        {
            reader.Problem(declared.Value.Position, "model.variables: a model needs at least one variable");
        }

        CheckNames(reader, variables, parameters);
        var forcing = reader.Number(table, "forcing_period", p => p > 0, "must be > 0");
        if (reader.Problems.Count > before || table.Find("variables") is null)
        {
            // The declarations are unusable; checks that rely on them would only repeat the problem.
            return null;
        }

        if (kindText == "map" && table.Find("forcing_period") is { } mapForcing)
        {
            reader.Problem(mapForcing.KeyPosition, "model.forcing_period: only flows are forced (a map has no time t)");
        }

        var equations = ReadEquations(reader, table, variables, parameters, kindText == "flow", out var usesTime);
        if (kindText is null || equations is null)
        {
            return null;
        }

        if (kindText == "flow" && usesTime && table.Find("forcing_period") is null)
        {
            reader.Problem(table.Position, "model: the equations use t, so give forcing_period (the period of the forcing, for stroboscopic sampling)");
        }

        if (kindText == "flow" && !usesTime && forcing is not null)
        {
            reader.Problem(table.Find("forcing_period")!.KeyPosition, "model.forcing_period: no equation uses t, so there is nothing to force");
        }

        return new ModelSource(
            kindText == "map" ? ModelKind.Map : ModelKind.Flow,
            variables.Select(v => v.Name).ToArray(),
            parameters.Select(p => p.Name).ToArray(),
            equations,
            forcing);
    }

    private static void CheckNames(ConfigReader reader, List<(string Name, SourcePosition Position)> variables, List<(string Name, SourcePosition Position)> parameters)
    {
        var seen = new HashSet<string>(StringComparer.Ordinal);
        foreach (var (name, position) in variables.Concat(parameters))
        {
            if (!IsIdentifier(name))
            {
                reader.Problem(position, $"model: '{name}' is not a valid name (letters, digits and _, not starting with a digit)");
            }
            else if (Scope.Reserved.Contains(name))
            {
                reader.Problem(position, $"model: '{name}' is reserved (a function, a constant or the time t)");
            }
            else if (Runs.PartSchema.Collides(name))
            {
                reader.Problem(position, $"model: '{name}' would collide with an output column; choose another name");
            }
            else if (!seen.Add(name))
            {
                reader.Problem(position, $"model: '{name}' is declared twice");
            }
        }
    }

    private static string[]? ReadEquations(
        ConfigReader reader,
        ConfigTable model,
        List<(string Name, SourcePosition Position)> variables,
        List<(string Name, SourcePosition Position)> parameters,
        bool allowTime,
        out bool usesTime)
    {
        usesTime = false;
        var table = reader.Table(model, "equations", required: true);
        if (table is null)
        {
            return null;
        }

        var names = variables.Select(v => v.Name).ToArray();
        var scope = new Scope(names, parameters.Select(p => p.Name).ToArray(), allowTime);
        var equations = new string[names.Length];
        var complete = true;
        foreach (var entry in table.Entries)
        {
            var slot = Array.IndexOf(names, entry.Key);
            if (slot < 0)
            {
                reader.Problem(entry.KeyPosition, $"model.equations.{entry.Key}: '{entry.Key}' is not a variable (variables: {List(names)})");
                continue;
            }

            if (entry.Value is not ConfigScalar { Value: string text })
            {
                reader.Problem(entry.Value.Position, $"model.equations.{entry.Key}: must be a string, not {entry.Value.TypeName}");
                complete = false;
                continue;
            }

            try
            {
                usesTime |= ExpressionQueries.Mentions(Parser.Parse(text, scope), SymbolKind.Time);
                equations[slot] = text;
            }
            catch (ExpressionException error)
            {
                // Point at the character inside the string: one past the opening quote.
                var at = new SourcePosition(entry.Value.Position.Line, entry.Value.Position.Column + error.Column);
                reader.Problem(at, $"model.equations.{entry.Key}: {error.Message}");
                complete = false;
            }
        }

        for (var i = 0; i < names.Length; i++)
        {
            if (equations[i] is null && table.Find(names[i]) is null)
            {
                reader.Problem(table.Position, $"model.equations: missing equation for '{names[i]}'");
                complete = false;
            }
        }

        return complete ? equations : null;
    }

    private static bool IsIdentifier(string name) =>
        name.Length > 0 && (char.IsAsciiLetter(name[0]) || name[0] == '_') && name.All(c => char.IsAsciiLetterOrDigit(c) || c == '_');
}
