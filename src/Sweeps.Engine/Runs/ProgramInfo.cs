using System.Reflection;

namespace Sweeps.Engine.Runs;

/// <summary>The program version recorded in manifests and part files.</summary>
public static class ProgramInfo
{
    public static string Version { get; } =
        typeof(ProgramInfo).Assembly.GetCustomAttribute<AssemblyInformationalVersionAttribute>()?.InformationalVersion.Split('+')[0]
        ?? "0.0.0";
}
