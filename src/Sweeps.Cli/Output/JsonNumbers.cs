using System.Text.Json;

namespace Sweeps.Cli.Output;

/// <summary>
/// JSON has no infinities: −∞ (a superstable exponent) and +∞ are written as the strings "-Infinity"
/// and "Infinity" (the spelling System.Text.Json reads back with AllowNamedFloatingPointLiterals), and
/// NaN — "not computed" — as null.
/// </summary>
internal static class JsonNumbers
{
    public static void Write(Utf8JsonWriter json, double value)
    {
        if (double.IsFinite(value))
        {
            json.WriteNumberValue(value);
        }
        else if (double.IsNaN(value))
        {
            json.WriteNullValue();
        }
        else
        {
            json.WriteStringValue(value > 0 ? "Infinity" : "-Infinity");
        }
    }

    /// <summary>Writes an array of numbers, as a property when <paramref name="name"/> is given, else as an array element.</summary>
    public static void WriteArray(Utf8JsonWriter json, string? name, IEnumerable<double> values)
    {
        if (name is null)
        {
            json.WriteStartArray();
        }
        else
        {
            json.WriteStartArray(name);
        }

        foreach (var value in values)
        {
            Write(json, value);
        }

        json.WriteEndArray();
    }

    public static void WriteObject(Utf8JsonWriter json, string name, IReadOnlyList<string> keys, IReadOnlyList<double> values)
    {
        json.WriteStartObject(name);
        for (var i = 0; i < keys.Count; i++)
        {
            json.WritePropertyName(keys[i]);
            Write(json, values[i]);
        }

        json.WriteEndObject();
    }
}
