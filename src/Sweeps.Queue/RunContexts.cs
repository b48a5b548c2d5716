using System.Collections.Concurrent;
using Sweeps.Engine.Execution;
using Sweeps.Engine.Runs;

namespace Sweeps.Queue;

/// <summary>
/// The run contexts of this process, one per run directory, built on first use: the model of a run
/// is parsed and compiled once per process, not once per job.
/// </summary>
public sealed class RunContexts
{
    private readonly ConcurrentDictionary<string, Lazy<RunContext>> contexts = new(StringComparer.Ordinal);

    public RunContext Get(string runDirectory) =>
        contexts.GetOrAdd(Path.TrimEndingDirectorySeparator(Path.GetFullPath(runDirectory)), path => new Lazy<RunContext>(() => new RunContext(RunDirectory.Open(path)))).Value;
}
