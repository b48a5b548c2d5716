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
        contexts.GetOrAdd(Key(runDirectory), path => new Lazy<RunContext>(() => new RunContext(RunDirectory.Open(path)))).Value;

    /// <summary>Registers a context the caller already built (the embedded run, whose model is compiled before the queue starts).</summary>
    public void Add(RunContext context) => contexts.TryAdd(Key(context.Run.FullPath), new Lazy<RunContext>(context));

    private static string Key(string runDirectory) => Path.TrimEndingDirectorySeparator(Path.GetFullPath(runDirectory));
}
