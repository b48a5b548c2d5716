using System.Diagnostics;
using System.Globalization;

namespace Sweeps.Cli.Output;

/// <summary>Progress as plain lines, for logs and pipes.</summary>
internal sealed class PlainProgressView(TextWriter output) : ProgressView
{
    private static readonly TimeSpan Every = TimeSpan.FromSeconds(5);

    public override async Task ShowAsync(long total, Func<long> done, Func<bool> poll, Func<Task> changed, CancellationToken token)
    {
        var clock = Stopwatch.StartNew();
        var next = Every;
        while (poll() && !token.IsCancellationRequested)
        {
            await Wait(changed, 100);
            if (clock.Elapsed >= next)
            {
                Write(total, done(), clock.Elapsed);
                next += Every;
            }
        }
    }

    private void Write(long total, long done, TimeSpan elapsed)
    {
        var percent = total == 0 ? 100 : 100.0 * done / total;
        output.WriteLine(string.Create(
            CultureInfo.InvariantCulture,
            $"progress      {percent,5:F1}%  {done:N0} of {total:N0} points  {Rate(done, elapsed)} points/s  ETA {Eta(done, total, elapsed)}"));
    }
}
