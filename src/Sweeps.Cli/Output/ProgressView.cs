using System.Globalization;

namespace Sweeps.Cli.Output;

/// <summary>
/// Shows a run's progress: points done, points/s and an ETA from the measured throughput. On a
/// terminal a live bar (Spectre.Console); otherwise a plain line every few seconds, since Spectre
/// prints nothing when output is redirected.
/// </summary>
internal abstract class ProgressView
{
    public static ProgressView Create(TextWriter output, bool interactive) =>
        interactive ? new TerminalProgressView() : new PlainProgressView(output);

    /// <summary>
    /// Shows progress of done out of total until <paramref name="poll"/> returns false; <paramref name="changed"/>
    /// gives a task that completes at the next chunk's end, so the display ends as soon as the work does.
    /// </summary>
    public abstract Task ShowAsync(long total, Func<long> done, Func<bool> poll, Func<Task> changed, CancellationToken token);

    /// <summary>Waits for the next change or the refresh interval, whichever comes first.</summary>
    protected static Task Wait(Func<Task> changed, int milliseconds) =>
        Task.WhenAny(changed(), Task.Delay(milliseconds, CancellationToken.None));

    protected static string Rate(long done, TimeSpan elapsed) =>
        elapsed.TotalSeconds > 0 ? (done / elapsed.TotalSeconds).ToString("N0", CultureInfo.InvariantCulture) : "–";

    protected static string Eta(long done, long total, TimeSpan elapsed)
    {
        if (done == 0 || elapsed.TotalSeconds <= 0)
        {
            return "–";
        }

        var seconds = (total - done) / (done / elapsed.TotalSeconds);
        return TimeSpan.FromSeconds(Math.Round(seconds)).ToString(seconds >= 3600 ? @"h\:mm\:ss" : @"m\:ss", CultureInfo.InvariantCulture);
    }
}
