using System.CommandLine;
using Hangfire;
using Microsoft.Extensions.DependencyInjection;
using Sweeps.Engine.Config;
using Sweeps.Queue;

namespace Sweeps.Cli.Commands;

/// <summary>The --queue option shared by submit, worker, status and cancel; the environment variable is how a container passes it.</summary>
internal static class QueueOptions
{
    public static Option<string?> Create() => new("--queue")
    {
        Description = $"PostgreSQL connection string of the shared queue (default: ${QueueSettings.EnvironmentVariable})",
    };

    public static string? Resolve(ParseResult parse, Option<string?> option)
    {
        var fromEnvironment = Environment.GetEnvironmentVariable(QueueSettings.EnvironmentVariable);
        return parse.GetValue(option) ?? (string.IsNullOrWhiteSpace(fromEnvironment) ? null : fromEnvironment);
    }

    public static string Require(ParseResult parse, Option<string?> option) =>
        Resolve(parse, option) ?? throw ConfigException.Single("--queue", $"give the queue's PostgreSQL connection string (or set {QueueSettings.EnvironmentVariable})");

    /// <summary>
    /// Runs one operation on the shared queue's storage and job client (a host that serves nothing), guarded as
    /// <see cref="Guard{T}"/> is.
    /// </summary>
    public static Task<T> Use<T>(string connection, Func<JobStorage, IBackgroundJobClient, T> action) =>
        Guard(connection, () =>
        {
            using var host = QueueHost.Build(new QueueSettings(1, connection), serve: false);
            return Task.FromResult(action(host.Services.GetRequiredService<JobStorage>(), host.Services.GetRequiredService<IBackgroundJobClient>()));
        });

    /// <summary>Runs a queue operation; a database that cannot be reached is reported with the password masked.</summary>
    public static async Task<T> Guard<T>(string connection, Func<Task<T>> action)
    {
        try
        {
            return await action();
        }
        catch (Exception error) when (error is Npgsql.NpgsqlException or System.Net.Sockets.SocketException or TimeoutException
            || error.InnerException is Npgsql.NpgsqlException)
        {
            throw new InvalidOperationException(
                ConnectionStrings.Scrub($"cannot use the queue at {ConnectionStrings.Mask(connection)}: {error.Message}", connection));
        }
    }
}
