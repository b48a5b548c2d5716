using System.Text.Json.Nodes;

namespace Sweeps.Engine.Runs;

/// <summary>
/// run.json: what made the run and how far it got. Written once when the run is created and again
/// when it finishes; the part files are the truth about which chunks are done.
/// </summary>
public sealed record RunManifest(
    int Format,
    string ProgramVersion,
    string SpecHash,
    string ModelHash,
    JsonObject Spec,
    IReadOnlyList<string> Overrides,
    string ConfigFile,
    long Points,
    IReadOnlyList<long> Shape,
    long ChunkSize,
    long ChunkCount,
    string State,
    DateTimeOffset Created,
    DateTimeOffset? Finished)
{
    public const int CurrentFormat = 2;
    public const string Running = "running";
    public const string Complete = "finished";
}
