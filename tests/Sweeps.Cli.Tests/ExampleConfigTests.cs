namespace Sweeps.Cli.Tests;

/// <summary>Every example in configs/ is valid and probe-able.</summary>
public sealed class ExampleConfigTests
{
    public static TheoryData<string> Configs()
    {
        var data = new TheoryData<string>();
        foreach (var file in Directory.GetFiles(RepoPaths.Combine("configs"), "*.toml").Order(StringComparer.Ordinal))
        {
            data.Add(Path.GetFileName(file));
        }

        return data;
    }

    [Theory]
    [MemberData(nameof(Configs))]
    public void Check_Succeeds_ForEveryExample(string name)
    {
        var run = CliRun.Of("check", RepoPaths.Combine("configs", name));
        Assert.True(run.ExitCode == 0, run.Error);
        Assert.Contains("valid", run.Output);
        Assert.Contains("chunks", run.Output);
    }

    [Theory]
    [MemberData(nameof(Configs))]
    public void Probe_Succeeds_ForEveryExample(string name)
    {
        var run = CliRun.Of("probe", RepoPaths.Combine("configs", name), "--json");
        Assert.True(run.ExitCode == 0, run.Error);
        Assert.Contains("\"regime\"", run.Output);
    }
}
