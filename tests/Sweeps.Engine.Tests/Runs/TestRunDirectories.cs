using Sweeps.Engine.Config;
using Sweeps.Engine.Execution;
using Sweeps.Engine.Runs;

namespace Sweeps.Engine.Tests.Runs;

/// <summary>Run directories of a config in a temporary folder, their chunks computed in this process as a worker would.</summary>
internal static class TestRunDirectories
{
    /// <summary>A new folder name under the temporary folder (not created).</summary>
    public static string Folder(string name) => Path.Combine(Path.GetTempPath(), $"sweeps-{name}-{Guid.NewGuid():N}");

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
