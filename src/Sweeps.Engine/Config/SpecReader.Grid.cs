using Sweeps.Core.Models;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Config;

public static partial class SpecReader
{
    private static Grid? ReadGrid(ConfigReader reader, ConfigTable root, ModelSource model)
    {
        var table = reader.Table(root, "grid", required: false);
        if (table is null)
        {
            return new Grid([]);
        }

        var axes = new List<GridAxis>();
        ConfigEntry? follow = null;
        foreach (var entry in table.Entries)
        {
            var name = entry.Key;
            if (name == "follow" && entry.Value is ConfigScalar { Value: string })
            {
                follow = entry;
                continue;
            }

            var parameter = IndexOf(model.Parameters, name);
            var variable = IndexOf(model.Variables, name);
            if (parameter < 0 && variable < 0)
            {
                var suggestion = Core.Expressions.NameSuggester.Closest(name, model.Parameters.Concat(model.Variables));
                var hint = suggestion is null ? "" : $" (did you mean '{suggestion}'?)";
                reader.Problem(entry.KeyPosition, $"grid.{name}: '{name}' is neither a parameter nor a variable of the model{hint}");
                continue;
            }

            var target = parameter >= 0 ? AxisTarget.Parameter : AxisTarget.Variable;
            if (ReadAxis(reader, entry, target, parameter >= 0 ? parameter : variable, "grid") is { } axis)
            {
                axes.Add(axis);
            }
        }

        var grid = new Grid(axes, follow is null ? null : ReadFollow(reader, follow, axes));
        var total = axes.Aggregate(1.0, (product, axis) => product * axis.Count);
        if (total > Grid.MaxPoints)
        {
            reader.Problem(table.Position, $"grid: {total:g3} points is more than Sweeps accepts ({Grid.MaxPoints:g3})");
            return null;
        }

        return grid;
    }

    /// <summary>
    /// <c>follow = "NAME"</c>: a continuation sweep along that parameter axis — each line of the grid along it
    /// is swept forward and then backward, each point starting from the previous one's final state.
    /// </summary>
    private static int? ReadFollow(ConfigReader reader, ConfigEntry entry, List<GridAxis> axes)
    {
        var name = (string)((ConfigScalar)entry.Value).Value!;
        var index = axes.FindIndex(a => a.Name == name);
        if (index < 0)
        {
            var suggestion = Core.Expressions.NameSuggester.Closest(name, axes.Select(a => a.Name));
            var hint = suggestion is null ? "" : $" (did you mean '{suggestion}'?)";
            reader.Problem(entry.Value.Position, $"grid.follow: '{name}' is not an axis of the grid{hint}");
            return null;
        }

        if (axes[index].Target != AxisTarget.Parameter)
        {
            reader.Problem(entry.Value.Position, $"grid.follow: '{name}' is a variable; a continuation sweep follows a parameter (each point starts where the previous one ended)");
            return null;
        }

        if (axes[index].Count < 2)
        {
            reader.Problem(entry.Value.Position, $"grid.follow: '{name}' has one value; there is nothing to follow");
            return null;
        }

        return index;
    }

    private static GridAxis? ReadAxis(ConfigReader reader, ConfigEntry entry, AxisTarget target, int slot, string section)
    {
        var name = $"{section}.{entry.Key}";
        if (entry.Value is not ConfigTable axis)
        {
            reader.Problem(entry.Value.Position, $"{name}: must be a table such as {{ from = 1, to = 2, steps = 100 }} or {{ values = [1, 2] }}");
            return null;
        }

        reader.OnlyKeys(axis, "from", "to", "steps", "spacing", "values");
        if (axis.Find("values") is { } listed)
        {
            if (axis.Entries.Count > 1)
            {
                reader.Problem(listed.KeyPosition, $"{name}: give either values or from/to/steps, not both");
                return null;
            }

            if (listed.Value is not ConfigArray { Items.Count: > 0 } array)
            {
                reader.Problem(listed.Value.Position, $"{name}.values: must be a non-empty array of numbers");
                return null;
            }

            var values = array.Items.Select(v => reader.Number(v, $"{name}.values", _ => true, "")).ToList();
            return values.All(v => v.HasValue)
                ? new GridAxis(entry.Key, target, slot, values[0]!.Value, values[^1]!.Value, values.Count, Values: values.Select(v => v!.Value).ToArray())
                : null;
        }

        var from = reader.Number(axis, "from", _ => true, "");
        var to = reader.Number(axis, "to", _ => true, "");
        var steps = reader.Integer(axis, "steps", 1, Grid.MaxPoints);
        var spacingText = reader.String(axis, "spacing", required: false, "linear", "log");
        foreach (var key in new[] { "from", "to", "steps" })
        {
            if (axis.Find(key) is null)
            {
                reader.Problem(axis.Position, $"{name}: missing '{key}'");
            }
        }

        if (from is not { } low || to is not { } high || steps is not { } count)
        {
            return null;
        }

        var spacing = spacingText == "log" ? AxisSpacing.Log : AxisSpacing.Linear;
        if (spacing == AxisSpacing.Log && !(low > 0 && high > 0))
        {
            reader.Problem(axis.Position, $"{name}: logarithmic spacing needs from and to both > 0");
            return null;
        }

        if (count > 1 && low == high)
        {
            reader.Problem(axis.Position, $"{name}: from equals to, so {count} steps would repeat one value");
            return null;
        }

        return new GridAxis(entry.Key, target, slot, low, high, count, spacing);
    }
}
