using System.Diagnostics;
using Spectre.Console;

namespace Sweeps.Cli.Output;

/// <summary>A live progress bar on a terminal.</summary>
internal sealed class TerminalProgressView : ProgressView
{
    public override async Task ShowAsync(long total, Func<long> done, Func<bool> poll, Func<Task> changed, CancellationToken token)
    {
        var clock = Stopwatch.StartNew();
        await AnsiConsole.Progress()
            .AutoClear(false)
            .Columns(new TaskDescriptionColumn(), new ProgressBarColumn(), new PercentageColumn(), new SpinnerColumn())
            .StartAsync(async context =>
            {
                var task = context.AddTask("points", maxValue: Math.Max(total, 1));
                while (poll() && !token.IsCancellationRequested)
                {
                    await Wait(changed, 200);
                    var now = done();
                    task.Value = now;
                    task.Description = $"{now:N0} of {total:N0} points · {Rate(now, clock.Elapsed)}/s · ETA {Eta(now, total, clock.Elapsed)}";
                }

                task.Value = done();
            });
    }
}
