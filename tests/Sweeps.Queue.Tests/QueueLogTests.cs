using System.Collections.Concurrent;
using Microsoft.Extensions.Logging;

namespace Sweeps.Queue.Tests;

/// <summary>The queue library's messages, as a worker prints them (<c>sweeps worker --log</c>).</summary>
public sealed class QueueLogTests
{
    [Fact]
    public async Task Build_PassesHangfireMessagesToTheLog_FromItsLevelUp()
    {
        var info = new ConcurrentQueue<string>();
        using (var host = QueueHost.Build(new QueueSettings(Workers: 1), log: new QueueLog(LogLevel.Information, info.Enqueue)))
        {
            await host.StartAsync();
            await host.StopAsync();
        }

        // Hangfire announces its server's start and stop at the information level.
        Assert.Contains(info, line => line.Contains(" info Hangfire.", StringComparison.Ordinal));
        Assert.DoesNotContain(info, line => line.Contains(" debug ", StringComparison.Ordinal));

        var warnings = new ConcurrentQueue<string>();
        using (var host = QueueHost.Build(new QueueSettings(Workers: 1), log: new QueueLog(LogLevel.Warning, warnings.Enqueue)))
        {
            await host.StartAsync();
            await host.StopAsync();
        }

        Assert.Empty(warnings);
    }

    [Fact]
    public void Log_WritesOneLineWithTheExceptionsMessages_BelowDebug()
    {
        var lines = new List<string>();
        using var provider = new QueueLog(LogLevel.Warning, lines.Add).Provider();
        var logger = provider.CreateLogger("Hangfire.Server.Worker");
        logger.LogWarning(new InvalidOperationException("outer", new TimeoutException("inner")), "state change failed");
        logger.LogInformation("not shown");

        var line = Assert.Single(lines);
        Assert.EndsWith(" warning Hangfire.Server.Worker: state change failed (InvalidOperationException: outer <- TimeoutException: inner)", line, StringComparison.Ordinal);
        Assert.DoesNotContain('\n', line);
    }

    [Fact]
    public void Log_CarriesTheWholeException_AtDebug()
    {
        var lines = new List<string>();
        using var provider = new QueueLog(LogLevel.Debug, lines.Add).Provider();
        Exception thrown;
        try
        {
            throw new InvalidOperationException("lock lost");
        }
        catch (InvalidOperationException error)
        {
            thrown = error;
        }

        provider.CreateLogger("Hangfire.PostgreSql.PostgreSqlDistributedLock").LogDebug(thrown, "retrying");
        var line = Assert.Single(lines);
        Assert.Contains(" debug Hangfire.PostgreSql.PostgreSqlDistributedLock: retrying\n", line, StringComparison.Ordinal);
        Assert.Contains(nameof(Log_CarriesTheWholeException_AtDebug), line, StringComparison.Ordinal);
    }
}
