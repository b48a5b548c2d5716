using YamlDotNet.RepresentationModel;

namespace Sweeps.EndToEnd.Tests;

/// <summary>
/// docker-compose.yml cannot be run here (no Docker engine on the build machines), so it is parsed with
/// a YAML parser and checked against what the process-level tests do: a queue, scalable workers
/// reading SWEEPS_QUEUE, a shared run volume mounted at one path, and a submit entry point.
/// </summary>
public sealed class ComposeFileTests
{
    private static YamlMappingNode Services()
    {
        var stream = new YamlStream();
        using var reader = new StreamReader(Path.Combine(SweepsProcess.RepoRoot, "docker-compose.yml"));
        stream.Load(reader);
        var root = (YamlMappingNode)stream.Documents[0].RootNode;
        return (YamlMappingNode)root["services"];
    }

    [Fact]
    public void Compose_HasQueueWorkerAndSubmit_WiredLikeTheTests()
    {
        var services = Services();
        Assert.Equal(["postgres", "worker", "submit"], services.Children.Keys.Select(k => k.ToString()));

        var worker = (YamlMappingNode)services["worker"];
        Assert.Equal("worker", ((YamlSequenceNode)worker["command"]).Children[0].ToString());
        Assert.False(worker.Children.ContainsKey("container_name"), "a container_name would stop --scale worker=N");
        Assert.False(worker.Children.ContainsKey("ports"), "published ports would stop --scale worker=N");
        var queue = ((YamlMappingNode)worker["environment"])["SWEEPS_QUEUE"].ToString();
        Assert.Contains("Host=postgres", queue);

        var submit = (YamlMappingNode)services["submit"];
        Assert.Equal(["dotnet", "/app/sweeps.dll", "submit"], ((YamlSequenceNode)submit["entrypoint"]).Children.Select(c => c.ToString()));
        Assert.Equal(queue, ((YamlMappingNode)submit["environment"])["SWEEPS_QUEUE"].ToString());

        // Jobs name their run by path: every service that touches runs mounts them at the same place.
        string Mount(YamlMappingNode service) => ((YamlSequenceNode)service["volumes"]).Children[0].ToString();
        Assert.Equal("runs:/runs", Mount(worker));
        Assert.Equal(Mount(worker), Mount(submit));
        Assert.Equal("SIGTERM", worker["stop_signal"].ToString());
    }

    [Fact]
    public void Dockerfile_BuildsTheCliAndInstallsFonts()
    {
        var dockerfile = File.ReadAllText(Path.Combine(SweepsProcess.RepoRoot, "Dockerfile"));
        Assert.Contains("dotnet publish src/Sweeps.Cli", dockerfile);
        Assert.Contains("fonts-dejavu-core", dockerfile);
        Assert.Contains("ENTRYPOINT [\"dotnet\", \"/app/sweeps.dll\"]", dockerfile);
    }
}
