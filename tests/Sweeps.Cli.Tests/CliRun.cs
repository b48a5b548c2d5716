namespace Sweeps.Cli.Tests;

/// <summary>Runs the CLI in-process and captures what it printed.</summary>
internal sealed record CliRun(int ExitCode, string Output, string Error)
{
    public string[] ErrorLines => Error.Split('\n', StringSplitOptions.RemoveEmptyEntries).Select(l => l.TrimEnd('\r')).ToArray();

    public static CliRun Of(params string[] args)
    {
        var output = new StringWriter();
        var error = new StringWriter();
        var code = CliApp.Run(args, output, error);
        return new CliRun(code, output.ToString(), error.ToString());
    }
}
