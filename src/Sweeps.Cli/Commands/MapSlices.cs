using System.Globalization;
using Sweeps.Engine.Config;

namespace Sweeps.Cli.Commands;

/// <summary>Parses <c>--slice NAME=VALUE</c> options.</summary>
internal static class MapSlices
{
    public static Dictionary<string, double> Parse(IEnumerable<string> slices)
    {
        var result = new Dictionary<string, double>(StringComparer.Ordinal);
        foreach (var slice in slices)
        {
            var parts = slice.Split('=', 2);
            if (parts.Length != 2 || !double.TryParse(parts[1], NumberStyles.Float, CultureInfo.InvariantCulture, out var value))
            {
                throw ConfigException.Single($"--slice {slice}", "expected NAME=VALUE");
            }

            result[parts[0].Trim()] = value;
        }

        return result;
    }
}
