using System.Text.Json.Serialization;

namespace Sweeps.Engine.Runs;

/// <summary>
/// run.json's serialiser, generated at build time: snake_case names, indented. The reflection-based serialiser spent
/// 40–135 ms of a run's start setting itself up (on a spare thread, but one competing for the same two cores).
/// </summary>
[JsonSourceGenerationOptions(PropertyNamingPolicy = JsonKnownNamingPolicy.SnakeCaseLower, WriteIndented = true)]
[JsonSerializable(typeof(RunManifest))]
internal sealed partial class ManifestJson : JsonSerializerContext;
