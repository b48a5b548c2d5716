using Sweeps.Engine.Config;
using Sweeps.Engine.Execution;
using Sweeps.Engine.Runs;

namespace Sweeps.Engine.Tests.Runs;

/// <summary>Run directories of a config in a temporary folder, their chunks computed in this process as a worker would.</summary>
internal static class TestRunDirectories
{
    /// <summary>A new folder under the temporary folder (not created until used), deleted with everything in it on dispose.</summary>
    public static TestFolder Folder(string name) => new(Path.Combine(Path.GetTempPath(), $"sweeps-{name}-{Guid.NewGuid():N}"));

    public static RunDirectory Create(TestFolder folder, string config, long chunkSize) => Create(folder.Path, config, chunkSize);

    /// <summary>The run directory <c>run</c> in <paramref name="folder"/> for <paramref name="config"/>, in chunks of <paramref name="chunkSize"/> points.</summary>
    public static RunDirectory Create(string folder, string config, long chunkSize) =>
        RunDirectory.CreateOrResume(Path.Combine(folder, "run"), SpecReader.Parse(config, "test.toml"), config, [], chunkSize, TimeProvider.System).Run;

    /// <summary>The chunks (every missing one by default) computed by one process, a context of its own.</summary>
    public static async Task<RunContext> ComputeAsync(RunDirectory run, IEnumerable<long>? chunks = null)
    {
        var context = new RunContext(run);
        foreach (var chunk in (chunks ?? run.MissingChunks()).ToList())
        {
            await ChunkRunner.RunAsync(context, chunk, null, CancellationToken.None);
        }

        return context;
    }
}

/// <summary>A temporary folder of a test, deleted on dispose.</summary>
internal sealed class TestFolder(string path) : IDisposable
{
    public string Path { get; } = path;

    public void Dispose() => Directory.Delete(Path, recursive: true);
}
