using System.Globalization;
using Sweeps.Core.Expressions;
using Sweeps.Engine.Config;

namespace Sweeps.Engine.Specs;

/// <summary>
/// The single point a probe analyses: the spec's base values, with swept names at their axis' first
/// value unless a <c>--set NAME=VALUE</c> says otherwise.
/// </summary>
public sealed record PointOverrides(double[] Initial, double[] Parameters, IReadOnlyList<string> Notes)
{
    /// <summary>
    /// The spec with the base values changed by <c>--set</c> (for a whole run). Names swept by the grid
    /// cannot be set: their values come from the grid.
    /// </summary>
    public static SweepSpec ApplyToSpec(SweepSpec spec, IReadOnlyList<string> assignments)
    {
        var swept = assignments
            .Select(a => a.Split('=', 2)[0].Trim())
            .Where(name => spec.Grid.Axes.Any(axis => axis.Name == name))
            .Select(name => new ConfigProblem($"--set {name}", null, $"'{name}' is swept by the grid; change its axis in the config instead"))
            .ToList();
        if (swept.Count > 0)
        {
            throw new ConfigException(swept);
        }

        var point = Apply(spec, assignments);
        return spec with { Initial = point.Initial, Parameters = point.Parameters };
    }

    public static PointOverrides Apply(SweepSpec spec, IEnumerable<string> assignments)
    {
        var initial = spec.Initial.ToArray();
        var parameters = spec.Parameters.ToArray();
        var given = new HashSet<string>(StringComparer.Ordinal);
        var problems = new List<ConfigProblem>();
        foreach (var assignment in assignments)
        {
            var equals = assignment.IndexOf('=');
            var name = equals < 0 ? assignment : assignment[..equals].Trim();
            var text = equals < 0 ? "" : assignment[(equals + 1)..].Trim();
            var place = $"--set {assignment}";
            if (equals < 0)
            {
                problems.Add(new ConfigProblem(place, null, "expected NAME=VALUE"));
                continue;
            }

            if (!double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var value) || !double.IsFinite(value))
            {
                problems.Add(new ConfigProblem(place, null, $"'{text}' is not a finite number"));
                continue;
            }

            var parameter = IndexOf(spec.Model.Parameters, name);
            var variable = IndexOf(spec.Model.Variables, name);
            if (parameter >= 0)
            {
                parameters[parameter] = value;
            }
            else if (variable >= 0)
            {
                initial[variable] = value;
            }
            else
            {
                var suggestion = NameSuggester.Closest(name, spec.Model.Parameters.Concat(spec.Model.Variables));
                var hint = suggestion is null ? "" : $" (did you mean '{suggestion}'?)";
                problems.Add(new ConfigProblem(place, null, $"'{name}' is neither a parameter nor a variable of the model{hint}"));
                continue;
            }

            given.Add(name);
        }

        if (problems.Count > 0)
        {
            throw new ConfigException(problems);
        }

        var notes = spec.Grid.Axes
            .Where(axis => !given.Contains(axis.Name))
            .Select(axis => $"{axis.Name} = {axis.ValueAt(0).ToString("R", CultureInfo.InvariantCulture)} is the first value of its grid axis; choose another with --set {axis.Name}=VALUE")
            .ToList();
        return new PointOverrides(initial, parameters, notes);
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
}
