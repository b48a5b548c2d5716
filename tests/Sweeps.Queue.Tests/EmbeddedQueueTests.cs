using Hangfire;
using Microsoft.Extensions.DependencyInjection;
using Sweeps.Engine.Config;
using Sweeps.Engine.Runs;

namespace Sweeps.Queue.Tests;

/// <summary>Chunk jobs through the real Hangfire machinery on in-memory storage.</summary>
public sealed class EmbeddedQueueTests : IDisposable
{
    private const string Config = """
        [model]
        kind = "map"
        variables = ["x"]
        parameters = ["r"]
        [model.equations]
        x = "r*x*(1 - x)"
        [initial]
        x = 0.3
        [grid]
        r = { from = 2.9, to = 3.3, steps = 300 }
        [analysis]
        transient = 500
        measure = 500
        lyapunov = "largest"
        max_period = 16
        """;

    private readonly string folder = Path.Combine(Path.GetTempPath(), "sweeps-queue-" + Guid.NewGuid().ToString("N")[..12]);

    [Fact]
    public async Task Jobs_WriteEveryPart_AndCountEveryPoint()
    {
        var run = CreateRun(chunkSize: 32);
        using var host = QueueHost.Build(new QueueSettings(Workers: 2));
        var counters = host.Services.GetRequiredService<RunProgress>().For(run.FullPath);
        var storage = host.Services.GetRequiredService<JobStorage>();
        var client = host.Services.GetRequiredService<IBackgroundJobClient>();
        Assert.Equal(new ChunkQueue.SubmitCounts(10, 0), ChunkQueue.Submit(storage, client, run.FullPath, run.MissingChunks()));

        // Submitting again queues nothing twice.
        Assert.Equal(new ChunkQueue.SubmitCounts(0, 0), ChunkQueue.Submit(storage, client, run.FullPath, run.MissingChunks()));
        await host.StartAsync();
        var deadline = DateTime.UtcNow.AddMinutes(1);
        while (counters.ChunksDone + counters.ChunksFailed < 10 && DateTime.UtcNow < deadline)
        {
            await Task.Delay(20);
        }

        await host.StopAsync();
        Assert.Equal(10, counters.ChunksDone);
        Assert.Equal(0, counters.ChunksFailed);
        Assert.Equal(300, counters.Points);
        Assert.Empty(run.MissingChunks());

        // Exact: on the logistic fixed point (r < 3) the period is 1; on the 2-cycle (3 < r < 1+√6) it is 2.
        var summary = await RunSummary.ReadAsync(run);
        Assert.Equal(300, summary.PointsDone);
        Assert.True(summary.Periods[1] > 0 && summary.Periods[2] > 0);
    }

    [Fact]
    public async Task Submit_QueuesAgain_OnlyTheChunksWhoseJobIsGone()
    {
        var run = CreateRun(chunkSize: 32);
        using var host = QueueHost.Build(new QueueSettings(Workers: 2));
        var counters = host.Services.GetRequiredService<RunProgress>().For(run.FullPath);
        var storage = host.Services.GetRequiredService<JobStorage>();
        var client = host.Services.GetRequiredService<IBackgroundJobClient>();
        ChunkQueue.Submit(storage, client, run.FullPath, run.MissingChunks());

        // Two chunks' jobs deleted before any worker ran: the set still says "queued", but nothing would compute them.
        var jobs = storage.GetMonitoringApi().EnqueuedJobs("default", 0, 100)
            .ToDictionary(j => Convert.ToInt64(j.Value.Job.Args[1], System.Globalization.CultureInfo.InvariantCulture), j => j.Key);
        Assert.True(client.Delete(jobs[3]));
        Assert.True(client.Delete(jobs[7]));
        Assert.Equal(Enumerable.Range(0, 10).Select(i => (long)i).Except([3L, 7L]), QueueStatus.Read(storage, run.FullPath).Live.Order());

        // A chunk whose part turns up between the listing of the missing chunks and the look at the queue is left alone.
        Assert.Equal(new ChunkQueue.SubmitCounts(1, 1), ChunkQueue.Submit(storage, client, run.FullPath, run.MissingChunks(), chunk => chunk != 7));
        Assert.Equal(new ChunkQueue.SubmitCounts(1, 1), ChunkQueue.Submit(storage, client, run.FullPath, run.MissingChunks()));
        Assert.Equal(new ChunkQueue.SubmitCounts(0, 0), ChunkQueue.Submit(storage, client, run.FullPath, run.MissingChunks()));
        await host.StartAsync();
        var deadline = DateTime.UtcNow.AddMinutes(1);
        while (run.MissingChunks().Count > 0 && DateTime.UtcNow < deadline)
        {
            await Task.Delay(20);
        }

        await host.StopAsync();
        Assert.Empty(run.MissingChunks());
        Assert.Equal(0, counters.ChunksFailed);
    }

    [Fact]
    public async Task FailedChunks_AreReported_WithTheirRunAndCause()
    {
        var run = CreateRun(chunkSize: 100);
        using var host = QueueHost.Build(new QueueSettings(Workers: 1));
        var progress = host.Services.GetRequiredService<RunProgress>();
        var reported = new System.Collections.Concurrent.ConcurrentQueue<(string Run, string Failure)>();
        progress.ChunkFailed += (directory, failure) => reported.Enqueue((directory, failure));
        var counters = progress.For(run.FullPath);
        ChunkQueue.Submit(host.Services.GetRequiredService<JobStorage>(), host.Services.GetRequiredService<IBackgroundJobClient>(), run.FullPath, run.MissingChunks());

        // The manifest gone, no worker can open the run: every chunk fails, and each failure is reported once.
        File.Delete(Path.Combine(run.FullPath, "run.json"));
        await host.StartAsync();
        var deadline = DateTime.UtcNow.AddMinutes(1);
        while (counters.ChunksFailed < 3 && DateTime.UtcNow < deadline)
        {
            await Task.Delay(20);
        }

        await host.StopAsync();
        Assert.Equal(3, counters.ChunksFailed);
        Assert.Equal(["chunk 0", "chunk 1", "chunk 2"], reported.Select(r => r.Failure.Split(':')[0]).Order());
        Assert.All(reported, r => Assert.Equal(run.FullPath, r.Run));
        Assert.All(reported, r => Assert.Contains("run.json", r.Failure));
    }

    [Fact]
    public void Contexts_CompileEachRunOncePerProcess()
    {
        var run = CreateRun(chunkSize: 100);
        var contexts = new RunContexts();
        var first = contexts.Get(run.FullPath);
        Assert.Same(first, contexts.Get(run.FullPath + Path.DirectorySeparatorChar));
        Assert.Same(first.Model, contexts.Get(run.FullPath).Model);
    }

    public void Dispose()
    {
        if (Directory.Exists(folder))
        {
            Directory.Delete(folder, recursive: true);
        }
    }

    private RunDirectory CreateRun(long chunkSize)
    {
        var spec = SpecReader.Parse(Config, "queue.toml");
        return RunDirectory.CreateOrResume(Path.Combine(folder, "run"), spec, Config, [], chunkSize, TimeProvider.System).Run;
    }
}
