namespace Sweeps.Maps;

/// <summary>
/// ScottPlot draws text with fonts it can find, and with none all text silently disappears. So font
/// files are registered explicitly (regular and bold), from SWEEPS_FONT_DIR or the usual DejaVu
/// location, and rendering fails with a clear message when there are none.
/// </summary>
public static class FontSetup
{
    public const string Family = "DejaVu Sans";

    private static readonly object Gate = new();
    private static bool done;

    public static void EnsureRegistered()
    {
        lock (Gate)
        {
            if (done)
            {
                return;
            }

            var folders = new[] { Environment.GetEnvironmentVariable("SWEEPS_FONT_DIR"), "/usr/share/fonts/truetype/dejavu", "/usr/share/fonts/dejavu" }
                .Where(f => !string.IsNullOrEmpty(f) && Directory.Exists(f))
                .ToList();
            var regular = folders.Select(f => Path.Combine(f!, "DejaVuSans.ttf")).FirstOrDefault(File.Exists);
            var bold = folders.Select(f => Path.Combine(f!, "DejaVuSans-Bold.ttf")).FirstOrDefault(File.Exists);
            if (regular is null || bold is null)
            {
                throw new InvalidOperationException(
                    "no font files for map text: install DejaVu Sans (Debian: fonts-dejavu-core) or set SWEEPS_FONT_DIR to a folder with DejaVuSans.ttf and DejaVuSans-Bold.ttf");
            }

            ScottPlot.Fonts.AddFontFile(Family, regular, bold: false, italic: false);
            ScottPlot.Fonts.AddFontFile(Family, bold, bold: true, italic: false);
            ScottPlot.Fonts.Default = Family;
            done = true;
        }
    }
}
