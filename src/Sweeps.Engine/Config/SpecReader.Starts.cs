using Sweeps.Core.Models;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Config;

public static partial class SpecReader
{
    /// <summary>
    /// Reads <c>[analysis] starts</c> and the <c>[starts]</c> box: one entry per variable, written like a grid
    /// axis. With steps (or values) on every entry the starts are that lattice; with only from/to they are
    /// <c>starts</c> uniform draws, seeded by <c>seed</c> (default 0) and the point index.
    /// </summary>
    private static StartSpec? ReadStarts(ConfigReader reader, ConfigTable root, ModelSource model, Grid grid)
    {
        var analysis = root.Find("analysis")?.Value as ConfigTable;
        var count = analysis is null ? null : reader.Integer(analysis, "starts", 1, StartSpec.MaxCount);
        var table = reader.Table(root, "starts", required: false);
        if (table is null)
        {
            if (count > 1)
            {
                reader.Problem(analysis!.Find("starts")!.Value.Position, "analysis.starts: several starts need a [starts] table with a range per variable, such as x = { from = -1, to = 1 }");
            }

            return null;
        }

        if (grid.Follow is not null)
        {
            reader.Problem(table.Position, "starts: a continuation sweep (grid.follow) starts each point from the previous one's end; it takes no [starts]");
            return null;
        }

        var seed = reader.Integer(table, "seed", 0, long.MaxValue);
        var ranges = new List<StartRange>();
        var lattice = new List<GridAxis>();
        foreach (var entry in table.Entries.Where(e => e.Key != "seed"))
        {
            var slot = IndexOf(model.Variables, entry.Key);
            if (slot < 0)
            {
                var suggestion = Core.Expressions.NameSuggester.Closest(entry.Key, model.Variables);
                var hint = suggestion is null ? $" (variables: {List(model.Variables)})" : $" (did you mean '{suggestion}'?)";
                reader.Problem(entry.KeyPosition, $"starts.{entry.Key}: '{entry.Key}' is not a variable of the model{hint}");
                continue;
            }

            if (grid.Axes.Any(a => a.Target == AxisTarget.Variable && a.Slot == slot))
            {
                reader.Problem(entry.KeyPosition, $"starts.{entry.Key}: '{entry.Key}' is also swept in [grid]; keep one of the two");
                continue;
            }

            if (entry.Value is ConfigTable range && (range.Find("steps") is not null || range.Find("values") is not null))
            {
                if (ReadAxis(reader, entry, AxisTarget.Variable, slot, "starts") is { } axis)
                {
                    lattice.Add(axis);
                    ranges.Add(new StartRange(entry.Key, slot, axis.From, axis.To));
                }

                continue;
            }

            if (ReadRange(reader, entry, slot) is { } drawn)
            {
                ranges.Add(drawn);
            }
        }

        if (ranges.Count == 0)
        {
            if (reader.Problems.Count == 0)
            {
                reader.Problem(table.Position, "starts: give a range for at least one variable, such as x = { from = -1, to = 1 }");
            }

            return null;
        }

        if (lattice.Count > 0)
        {
            return Lattice(reader, table, analysis, count, seed, ranges, lattice);
        }

        if (count is null)
        {
            if (analysis?.Find("starts") is not null)
            {
                return null; // already reported as out of range or not an integer
            }

            reader.Problem(analysis?.Position ?? table.Position, "analysis.starts: say how many starts to draw from the [starts] box (or give every range steps for a lattice)");
            return null;
        }

        return new StartSpec((int)count.Value, ranges, null, (ulong)(seed ?? 0));
    }

    private static StartSpec? Lattice(
        ConfigReader reader, ConfigTable table, ConfigTable? analysis, long? count, long? seed, List<StartRange> ranges, List<GridAxis> lattice)
    {
        if (lattice.Count != ranges.Count)
        {
            reader.Problem(table.Position, "starts: give steps for every variable (a lattice) or for none (random draws), not for some");
            return null;
        }

        if (seed is not null)
        {
            reader.Problem(table.Find("seed")!.Value.Position, "starts.seed: a lattice has no random draws to seed");
        }

        var product = lattice.Aggregate(1.0, (total, axis) => total * axis.Count);
        if (product > StartSpec.MaxCount)
        {
            reader.Problem(table.Position, $"starts: the lattice has {product:g3} starts, more than {StartSpec.MaxCount}");
            return null;
        }

        if (count is { } given && given != (long)product)
        {
            reader.Problem(analysis!.Find("starts")!.Value.Position, $"analysis.starts: {given}, but the [starts] lattice has {product} starts (leave starts out or make them agree)");
            return null;
        }

        return new StartSpec((int)product, ranges, new Grid(lattice), 0);
    }

    private static StartRange? ReadRange(ConfigReader reader, ConfigEntry entry, int slot)
    {
        var name = $"starts.{entry.Key}";
        if (entry.Value is not ConfigTable range)
        {
            reader.Problem(entry.Value.Position, $"{name}: must be a table such as {{ from = -1, to = 1 }} (add steps for a lattice)");
            return null;
        }

        reader.OnlyKeys(range, "from", "to");
        var from = reader.Number(range, "from", double.IsFinite, "must be finite");
        var to = reader.Number(range, "to", double.IsFinite, "must be finite");
        foreach (var key in new[] { "from", "to" })
        {
            if (range.Find(key) is null)
            {
                reader.Problem(range.Position, $"{name}: missing '{key}'");
            }
        }

        return from is { } low && to is { } high ? new StartRange(entry.Key, slot, low, high) : null;
    }
}
