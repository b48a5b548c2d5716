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

    // The run directory as the jobs name it (their argument), by key: the queue's lists of a run are keyed by that name.
    private readonly ConcurrentDictionary<string, string> names = new(StringComparer.Ordinal);

    public RunContext Get(string runDirectory)
    {
        var key = Key(runDirectory);
        names.TryAdd(key, runDirectory);
        return contexts.GetOrAdd(key, path => new Lazy<RunContext>(() => new RunContext(RunDirectory.Open(path)))).Value;
    }

    /// <summary>The runs whose context this process has built, each with the directory as its jobs name it.</summary>
    public IEnumerable<(string Queued, RunContext Context)> Known =>
        contexts.Where(c => c.Value.IsValueCreated).Select(c => (names.GetValueOrDefault(c.Key, c.Key), c.Value.Value));

    /// <summary>Registers a context the caller already built (the embedded run, whose model is compiled before the queue starts).</summary>
    public void Add(RunContext context) => contexts.TryAdd(Key(context.Run.FullPath), new Lazy<RunContext>(context));

    private static string Key(string runDirectory) => Path.TrimEndingDirectorySeparator(Path.GetFullPath(runDirectory));
}
