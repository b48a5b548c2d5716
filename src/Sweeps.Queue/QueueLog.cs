using Microsoft.Extensions.Logging;

namespace Sweeps.Queue;

/// <summary>
/// What a worker on a shared queue reports of the queue library's own messages — a lock it cannot take, a state change
/// it retries, the database out of reach — and where: one line each, from <see cref="Level"/> up, to
/// <see cref="Write"/> (the CLI's standard error). Without it those messages are dropped, and a worker that is stuck
/// says nothing of why.
/// </summary>
public sealed record QueueLog(LogLevel Level, Action<string> Write)
{
    /// <summary>The names <c>--log</c> takes, quietest first.</summary>
    public static readonly IReadOnlyList<(string Name, LogLevel Level)> Levels =
        [("error", LogLevel.Error), ("warning", LogLevel.Warning), ("info", LogLevel.Information), ("debug", LogLevel.Debug)];

    internal ILoggerProvider Provider() => new LineProvider(this);

    private static string Name(LogLevel level) => level switch
    {
        LogLevel.Critical or LogLevel.Error => "error",
        LogLevel.Warning => "warning",
        LogLevel.Information => "info",
        _ => "debug",
    };

    private sealed class LineProvider(QueueLog log) : ILoggerProvider
    {
        public ILogger CreateLogger(string categoryName) => new LineLogger(log, categoryName);

        public void Dispose()
        {
        }
    }

    private sealed class LineLogger(QueueLog log, string category) : ILogger
    {
        public IDisposable? BeginScope<TState>(TState state)
            where TState : notnull => null;

        public bool IsEnabled(LogLevel logLevel) => logLevel != LogLevel.None && logLevel >= log.Level;

        public void Log<TState>(LogLevel logLevel, EventId eventId, TState state, Exception? exception, Func<TState, Exception?, string> formatter)
        {
            if (!IsEnabled(logLevel))
            {
                return;
            }

            // At the debug level a line carries the whole exception (its stack too); otherwise its types and messages.
            var text = $"{DateTime.UtcNow:HH:mm:ss.fff} {Name(logLevel)} {category}: {formatter(state, exception)}";
            if (exception is not null)
            {
                text += log.Level <= LogLevel.Debug ? $"\n{exception}" : $" ({Messages(exception)})";
            }

            log.Write(text);
        }

        private static string Messages(Exception exception)
        {
            var parts = new List<string>();
            for (var e = exception; e is not null; e = e.InnerException)
            {
                parts.Add($"{e.GetType().Name}: {e.Message}");
            }

            return string.Join(" <- ", parts);
        }
    }
}
