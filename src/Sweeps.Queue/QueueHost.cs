using Hangfire;
using Hangfire.InMemory;
using Hangfire.PostgreSql;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;

namespace Sweeps.Queue;

/// <summary>
/// The generic host that serves chunk jobs: Hangfire on in-memory storage (embedded default) or on
/// PostgreSQL (many hosts), with one worker thread per core unless told otherwise. Everything goes
/// through DI; there is no static storage.
/// </summary>
public static class QueueHost
{
    public static IHost Build(QueueSettings settings, bool serve = true, QueueLog? log = null)
    {
        // The empty builder: no configuration files, environment or command-line sources and no logging providers
        // (the default builder's JSON sources even start a file watcher) — a tenth of a second less to start.
        var builder = Host.CreateEmptyApplicationBuilder(new HostApplicationBuilderSettings());
        builder.Services.AddLogging();
        if (log is not null)
        {
            // Hangfire writes through the host's logger factory (Hangfire.NetCore hands it over).
            builder.Logging.SetMinimumLevel(log.Level);
            builder.Logging.AddProvider(log.Provider());
        }

        builder.Services.Configure<HostOptions>(o => o.ShutdownTimeout = TimeSpan.FromSeconds(30));
        builder.Services.AddSingleton<RunContexts>();
        builder.Services.AddSingleton<RunProgress>();
        builder.Services.AddSingleton(settings);
        builder.Services.AddHangfire(configuration =>
        {
            configuration
                .SetDataCompatibilityLevel(CompatibilityLevel.Version_180)
                .UseSimpleAssemblyNameTypeSerializer()
                .UseRecommendedSerializerSettings()
                .UseFilter(new AutomaticRetryAttribute { Attempts = 0 });
            if (settings.Connection is { } connection)
            {
                configuration.UsePostgreSqlStorage(
                    options => options.UseNpgsqlConnection(connection),
                    new PostgreSqlStorageOptions
                    {
                        SchemaName = "sweeps",
                        PrepareSchemaIfNecessary = true,

                        // Without the sliding timeout a chunk running longer than the invisibility
                        // timeout is started again while the first run is still going.
                        UseSlidingInvisibilityTimeout = true,
                        InvisibilityTimeout = settings.Invisibility ?? QueueSettings.DefaultInvisibility,
                        // An idle worker looks for jobs once a second. Long polling is off: with it the storage opens
                        // a listening connection for every fetch and, the job already taken, waits without a time
                        // limit for that listener to stop — a wait that would hold the job unstarted, its queue
                        // entry kept alive, if the listener never stopped.
                        QueuePollInterval = TimeSpan.FromSeconds(1),
                        EnableLongPolling = false,
                        DistributedLockTimeout = TimeSpan.FromSeconds(30),
                    });
            }
            else
            {
                configuration.UseInMemoryStorage(new InMemoryStorageOptions());
            }
        });
        if (serve)
        {
            builder.Services.AddHangfireServer(options =>
            {
                options.WorkerCount = settings.Workers;

                // In memory, a server needs its workers alone: chunk jobs are neither delayed nor recurring, and the
                // storage expires nothing through background processes. Without the two schedulers and the storage's
                // processes, five threads fewer start with every run. PostgreSQL keeps them: its sliding invisibility
                // timeout is renewed by one of the storage's processes.
                options.IsLightweightServer = settings.Connection is null;
                options.ServerName = $"{Environment.MachineName}:{Environment.ProcessId}";

                // A running chunk sees cancellation within a few hundred points; give it time to stop.
                options.ShutdownTimeout = TimeSpan.FromSeconds(20);
                options.StopTimeout = TimeSpan.FromMilliseconds(500);
                options.HeartbeatInterval = TimeSpan.FromSeconds(5);
                options.ServerTimeout = TimeSpan.FromSeconds(30);
                options.ServerCheckInterval = TimeSpan.FromSeconds(15);
            });
            if (settings.Connection is not null)
            {
                builder.Services.AddHostedService<LostChunkWatch>();
            }
        }

        return builder.Build();
    }
}
