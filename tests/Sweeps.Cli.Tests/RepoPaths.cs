namespace Sweeps.Cli.Tests;

/// <summary>Locates files of the repository from the test's output directory.</summary>
internal static class RepoPaths
{
    public static string Root { get; } = FindRoot();

    public static string Combine(params string[] parts) => Path.Combine([Root, .. parts]);

    private static string FindRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "Sweeps.sln")))
            {
                return dir.FullName;
            }
        }

        throw new InvalidOperationException("Sweeps.sln not found above " + AppContext.BaseDirectory);
    }
}
