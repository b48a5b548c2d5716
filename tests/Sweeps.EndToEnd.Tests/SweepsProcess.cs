using System.Diagnostics;

namespace Sweeps.EndToEnd.Tests;

/// <summary>Runs the real sweeps executable (built beside this test project, same configuration) as a child process.</summary>
internal static class SweepsProcess
{
    public static string RepoRoot { get; } = FindRoot();

    private static readonly string Executable = FindExecutable();

    public static (int ExitCode, string Output, string Error) Run(string workingDirectory, params string[] args)
    {
        using var process = Start(workingDirectory, args);
        var output = process.StandardOutput.ReadToEndAsync();
        var error = process.StandardError.ReadToEndAsync();
        if (!process.WaitForExit(TimeSpan.FromMinutes(3)))
        {
            process.Kill(entireProcessTree: true);
            throw new TimeoutException($"sweeps {string.Join(' ', args)} did not finish");
        }

        return (process.ExitCode, output.Result, error.Result);
    }

    public static Process Start(string workingDirectory, params string[] args)
    {
        var start = new ProcessStartInfo("dotnet", [Executable, .. args])
        {
            WorkingDirectory = workingDirectory,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
        };
        return Process.Start(start)!;
    }

    private static string FindExecutable()
    {
        // bin/<Configuration>/net10.0 of this project ↔ the same of src/Sweeps.Cli.
        var here = new DirectoryInfo(AppContext.BaseDirectory.TrimEnd(Path.DirectorySeparatorChar));
        var framework = here.Name;
        var configuration = here.Parent!.Name;
        var path = Path.Combine(RepoRoot, "src", "Sweeps.Cli", "bin", configuration, framework, "sweeps.dll");
        return File.Exists(path) ? path : throw new FileNotFoundException("build src/Sweeps.Cli first", path);
    }

    private static string FindRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "Sweeps.sln")))
            {
                return dir.FullName;
            }
        }

        throw new InvalidOperationException("Sweeps.sln not found");
    }
}
