using Hangfire;
using Hangfire.InMemory;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;

namespace Sweeps.Queue;

/// <summary>
/// The embedded default: a generic host running a Hangfire server on in-memory storage inside this
/// process, with one worker per core unless told otherwise. Jobs go through the real Hangfire
/// machinery (storage, fetch, state changes), exactly as they do with a database behind it.
/// </summary>
public static class EmbeddedQueue
{
    public static IHost Build(int workers)
    {
        var builder = Host.CreateApplicationBuilder();
        builder.Logging.ClearProviders();
        builder.Services.Configure<HostOptions>(o => o.ShutdownTimeout = TimeSpan.FromSeconds(30));
        builder.Services.AddSingleton<RunContexts>();
        builder.Services.AddSingleton<RunProgress>();
        builder.Services.AddHangfire(configuration => configuration
            .SetDataCompatibilityLevel(CompatibilityLevel.Version_180)
            .UseSimpleAssemblyNameTypeSerializer()
            .UseRecommendedSerializerSettings()
            .UseInMemoryStorage(new InMemoryStorageOptions())
            .UseFilter(new AutomaticRetryAttribute { Attempts = 0 }));
        builder.Services.AddHangfireServer(options =>
        {
            options.WorkerCount = workers;
            options.ServerName = $"sweeps-{Environment.MachineName}-{Environment.ProcessId}";

            // Cancellation reaches a running chunk within a few hundred points; give it time to stop.
            options.ShutdownTimeout = TimeSpan.FromSeconds(20);
            options.StopTimeout = TimeSpan.FromMilliseconds(500);
        });
        return builder.Build();
    }

    public static void Enqueue(IBackgroundJobClient client, string runDirectory, IEnumerable<long> chunks)
    {
        foreach (var chunk in chunks)
        {
            client.Enqueue<ChunkJob>(job => job.RunAsync(runDirectory, chunk, CancellationToken.None));
        }
    }
}
