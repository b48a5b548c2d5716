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

    /// <summary>Runs <paramref name="poll"/> until it returns false, showing progress of done out of total.</summary>
    public abstract Task ShowAsync(long total, Func<long> done, Func<bool> poll, CancellationToken token);

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
