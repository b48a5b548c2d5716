namespace Sweeps.Cli.Tests;

/// <summary>
/// The bad-input corpus: every file in bad-inputs/ must give exit code 2 and exactly one line, equal to
/// its snapshot in bad-inputs/expected.txt (a change to an error line is a visible diff in review).
/// </summary>
public sealed class BadInputTests
{
    private static readonly string Folder = RepoPaths.Combine("tests", "Sweeps.Cli.Tests", "bad-inputs");

    public static TheoryData<string> Files()
    {
        var data = new TheoryData<string>();
        foreach (var file in Directory.GetFiles(Folder, "*.toml").Order(StringComparer.Ordinal))
        {
            data.Add(Path.GetFileName(file));
        }

        return data;
    }

    [Theory]
    [MemberData(nameof(Files))]
    public void Probe_ExitsWithTwoAndOneSnapshotLine_ForEveryBadInput(string name) => AssertRejected("probe", name);

    [Theory]
    [MemberData(nameof(Files))]
    public void Check_ExitsWithTwoAndOneSnapshotLine_ForEveryBadInput(string name) => AssertRejected("check", name);

    [Theory]
    [MemberData(nameof(Files))]
    public void Run_ExitsWithTwoAndWritesNothing_ForEveryBadInput(string name)
    {
        var target = Path.Combine(Path.GetTempPath(), "sweeps-bad-" + Guid.NewGuid().ToString("N")[..12]);
        var run = CliRun.Of("run", Path.Combine(Folder, name), "--out", target);
        Assert.Equal(2, run.ExitCode);
        Assert.Equal(Expected()[name], Assert.Single(run.ErrorLines).Replace(Folder + Path.DirectorySeparatorChar, ""));
        Assert.False(Directory.Exists(target));
    }

    [Fact]
    public void Corpus_HasOneSnapshotPerFile()
    {
        var files = Directory.GetFiles(Folder, "*.toml").Select(Path.GetFileName).Order(StringComparer.Ordinal);
        Assert.Equal(files, Expected().Keys.Order(StringComparer.Ordinal));
    }

    private static void AssertRejected(string command, string name)
    {
        var run = CliRun.Of(command, Path.Combine(Folder, name));
        Assert.Equal(2, run.ExitCode);
        var line = Assert.Single(run.ErrorLines);
        Assert.Equal(Expected()[name], line.Replace(Folder + Path.DirectorySeparatorChar, ""));
        Assert.Equal("", run.Output);
    }

    private static Dictionary<string, string> Expected() =>
        File.ReadAllLines(Path.Combine(Folder, "expected.txt"))
            .Where(l => l.Length > 0)
            .Select(l => l.Split('|', 2))
            .ToDictionary(p => p[0], p => p[1]);
}
