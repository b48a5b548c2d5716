using System.Text.Json;
using Sweeps.Engine.Config;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Runs;

/// <summary>
/// A run on disk: <c>run.json</c> (the manifest), <c>config.toml</c> (a copy of the config as given),
/// <c>parts/part-NNNNNN.parquet</c>, one file per finished chunk, and beside each
/// <c>attractors/part-NNNNNN.parquet</c>, the attractors found at its points (written first, so a
/// finished chunk always has both). A part file appears only
/// complete — it is written under a temporary name and renamed — so "the file exists" is what
/// "the chunk is done" means, for resuming and for any number of workers.
/// </summary>
public sealed class RunDirectory
{
    private RunDirectory(string path, RunManifest manifest)
    {
        FullPath = Path.TrimEndingDirectorySeparator(Path.GetFullPath(path));
        Manifest = manifest;
    }

    public string FullPath { get; }

    public RunManifest Manifest { get; private set; }

    public string PartsPath => Path.Combine(FullPath, "parts");

    public string AttractorPartsPath => Path.Combine(FullPath, "attractors");

    public string ConfigCopyPath => Path.Combine(FullPath, "config.toml");

    private string ManifestPath => Path.Combine(FullPath, "run.json");

    public string PartPath(long chunk) => Path.Combine(PartsPath, $"part-{chunk:D6}.parquet");

    public string AttractorPartPath(long chunk) => Path.Combine(AttractorPartsPath, $"part-{chunk:D6}.parquet");

    /// <summary>Boundary refinement level ℓ ≥ 1: <c>levels/ℓ/</c>, with its own <c>parts/</c> and <c>attractors/</c>.</summary>
    public string LevelPath(int level) => Path.Combine(FullPath, "levels", level.ToString(System.Globalization.CultureInfo.InvariantCulture));

    /// <summary>The levels whose points are all computed (their <c>level.json</c> exists), in order from 1.</summary>
    public int FinishedLevels()
    {
        var level = 0;
        while (File.Exists(Path.Combine(LevelPath(level + 1), "level.json")))
        {
            level++;
        }

        return level;
    }

    public bool IsDone(long chunk) => File.Exists(PartPath(chunk));

    public IReadOnlyList<long> MissingChunks()
    {
        var missing = new List<long>();
        for (var chunk = 0L; chunk < Manifest.ChunkCount; chunk++)
        {
            if (!IsDone(chunk))
            {
                missing.Add(chunk);
            }
        }

        return missing;
    }

    /// <summary>How many part files exist: one directory listing, cheap enough to ask after every chunk.</summary>
    public long CompletedParts() => Directory.EnumerateFiles(PartsPath, "part-*.parquet").LongCount();

    /// <summary>Opens an existing run; a missing or unreadable manifest is bad input.</summary>
    public static RunDirectory Open(string path)
    {
        var manifestPath = Path.Combine(path, "run.json");
        if (!File.Exists(manifestPath))
        {
            throw ConfigException.Single(path, "not a run directory (no run.json)");
        }

        try
        {
            var manifest = JsonSerializer.Deserialize(File.ReadAllText(manifestPath), ManifestJson.Default.RunManifest)
                ?? throw new JsonException("empty manifest");
            if (manifest.Format != RunManifest.CurrentFormat)
            {
                throw ConfigException.Single(manifestPath, $"run format {manifest.Format} is not readable by Sweeps {ProgramInfo.Version}");
            }

            return new RunDirectory(path, manifest);
        }
        catch (JsonException error)
        {
            throw ConfigException.Single(manifestPath, $"unreadable manifest: {error.Message}");
        }
    }

    /// <summary>
    /// Creates a run directory for <paramref name="spec"/>, or reopens one made by an earlier run of the
    /// same spec (a resume). A directory holding another spec's run, or unrelated files, is refused.
    /// </summary>
    public static (RunDirectory Run, bool Resumed) CreateOrResume(
        string path, SweepSpec spec, string configText, IReadOnlyList<string> overrides, long chunkSize, TimeProvider clock, bool cleanAbandoned = true)
    {
        var specHash = SpecFingerprint.SpecHash(spec);
        if (File.Exists(Path.Combine(path, "run.json")))
        {
            var existing = Open(path);
            if (existing.Manifest.SpecHash != specHash)
            {
                var changed = existing.Manifest.ModelHash != SpecFingerprint.ModelHash(spec.Model) ? "model" : "settings or grid";
                throw ConfigException.Single(
                    path,
                    $"holds a run of a different spec (its {changed} differ: spec {Short(existing.Manifest.SpecHash)} there, {Short(specHash)} here); choose another --out or remove it");
            }

            if (cleanAbandoned)
            {
                // Only the embedded run owns its directory; with shared workers a temporary file may be in use.
                existing.RemoveAbandonedParts();
            }

            return (existing, true);
        }

        if (Directory.Exists(path) && Directory.EnumerateFileSystemEntries(path).Any())
        {
            throw ConfigException.Single(path, "exists and is not a run directory; choose another --out");
        }

        try
        {
            Directory.CreateDirectory(Path.Combine(path, "parts"));
            Directory.CreateDirectory(Path.Combine(path, "attractors"));
            var manifest = new RunManifest(
                RunManifest.CurrentFormat,
                ProgramInfo.Version,
                specHash,
                SpecFingerprint.ModelHash(spec.Model),
                SpecFingerprint.Normalise(spec),
                overrides,
                spec.SourceFile,
                spec.Grid.PointCount,
                spec.Grid.Axes.Select(a => a.Count).ToArray(),
                chunkSize,
                (spec.Grid.PointCount + chunkSize - 1) / chunkSize,
                RunManifest.Running,
                clock.GetUtcNow(),
                null);
            File.WriteAllText(Path.Combine(path, "config.toml"), configText);
            var run = new RunDirectory(path, manifest);
            run.WriteManifest();
            return (run, false);
        }
        catch (Exception error) when (error is IOException or UnauthorizedAccessException)
        {
            throw ConfigException.Single(path, $"cannot create run directory: {error.Message}");
        }
    }

    /// <summary>The spec the run was made from: its copy of the config with its overrides applied.</summary>
    public SweepSpec LoadSpec()
    {
        var spec = SpecReader.Parse(File.ReadAllText(ConfigCopyPath), ConfigCopyPath);
        return PointOverrides.ApplyToSpec(spec, Manifest.Overrides);
    }

    public void MarkFinished(TimeProvider clock)
    {
        if (Manifest.State == RunManifest.Complete)
        {
            return;
        }

        Manifest = Manifest with { State = RunManifest.Complete, Finished = clock.GetUtcNow() };
        WriteManifest();
    }

    /// <summary>Deletes temporary part files left by a process that was killed while writing them.</summary>
    private void RemoveAbandonedParts() => RemoveAbandonedParts([PartsPath, AttractorPartsPath]);

    /// <summary>
    /// Deletes the temporary part files in <paramref name="folders"/> (a part is written under a temporary name while
    /// its chunk is computed, so a process killed mid-chunk leaves one behind). Only for a process that owns the folders.
    /// </summary>
    internal static void RemoveAbandonedParts(IEnumerable<string> folders)
    {
        foreach (var folder in folders.Where(Directory.Exists))
        {
            foreach (var temporary in Directory.EnumerateFiles(folder, "*.parquet.tmp-*"))
            {
                File.Delete(temporary);
            }
        }
    }

    private void WriteManifest()
    {
        // A unique temporary name: with shared workers, several processes may close the same run.
        var temporary = $"{ManifestPath}.tmp-{Guid.NewGuid():N}";
        File.WriteAllText(temporary, JsonSerializer.Serialize(Manifest, ManifestJson.Default.RunManifest));
        File.Move(temporary, ManifestPath, overwrite: true);
    }

    /// <summary>
    /// Fingerprints <paramref name="spec"/> and serialises a throw-away manifest: the first hash of a process loads the
    /// system's cryptography library, and the first serialisation still spends some milliseconds setting up
    /// (source-generated as the serialiser is) — which <c>run</c> does on a spare thread while it plans, before it
    /// creates the run directory.
    /// </summary>
    public static void WarmUp(SweepSpec spec)
    {
        _ = SpecFingerprint.SpecHash(spec);
        var normalised = new System.Text.Json.Nodes.JsonObject { ["grid"] = new System.Text.Json.Nodes.JsonArray(0.5, "x") };
        var manifest = new RunManifest(RunManifest.CurrentFormat, ProgramInfo.Version, "", "", normalised, [], "", 1, [1], 1, 1, RunManifest.Running, DateTimeOffset.UnixEpoch, null);
        _ = JsonSerializer.Serialize(manifest, ManifestJson.Default.RunManifest);
    }

    private static string Short(string hash) => hash[..12];
}
