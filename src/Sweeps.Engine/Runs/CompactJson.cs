using System.Buffers;
using System.Text.Json;
using System.Text.Json.Nodes;

namespace Sweeps.Engine.Runs;

/// <summary>
/// A JSON node's compact text, written straight to UTF-8. The nodes Sweeps builds hold only strings, integers, booleans and
/// nulls, whose writers the nodes carry; serialising them through options instead would set up the reflection serialiser
/// first — tens of milliseconds at the start of every run. The text is the same either way.
/// </summary>
internal static class CompactJson
{
    public static ReadOnlyMemory<byte> Utf8(JsonNode node)
    {
        var buffer = new ArrayBufferWriter<byte>(1024);
        using (var writer = new Utf8JsonWriter(buffer))
        {
            node.WriteTo(writer);
        }

        return buffer.WrittenMemory;
    }

    public static string Text(JsonNode node) => System.Text.Encoding.UTF8.GetString(Utf8(node).Span);
}
