using System.CommandLine;
using Sweeps.Cli.Commands;
using Sweeps.Engine.Config;

namespace Sweeps.Cli;

/// <summary>
/// The command line: builds the commands and is the one error boundary. Bad input (config problems,
/// bad arguments) exits 2 with one line per problem; any other failure exits 1 with one line, and a
/// stack trace only with --verbose.
/// </summary>
internal static class CliApp
{
    public static int Run(string[] args, TextWriter output, TextWriter error) =>
        Run(args, new CliContext(output, error, TimeProvider.System, Interactive: false));

    public static int Run(string[] args, CliContext cli)
    {
        var (output, error) = (cli.Output, cli.Error);
        var verbose = new Option<bool>("--verbose") { Description = "Show stack traces of failures", Recursive = true };
        var root = new RootCommand("Sweeps maps the operating regimes of nonlinear models over parameter grids.");
        root.Options.Add(verbose);
        root.Subcommands.Add(ProbeCommand.Create(output));
        root.Subcommands.Add(CheckCommand.Create(output));
        root.Subcommands.Add(RunCommand.Create(cli));
        root.Subcommands.Add(SubmitCommand.Create(cli));
        root.Subcommands.Add(WorkerCommand.Create(cli));
        root.Subcommands.Add(StatusCommand.Create(cli));
        root.Subcommands.Add(CancelCommand.Create(cli));
        root.Subcommands.Add(InspectCommand.Create(cli));
        root.Subcommands.Add(RefineCommand.Create(cli));
        root.Subcommands.Add(MapCommand.Create(cli));
        root.Subcommands.Add(DiffCommand.Create(cli));
        root.Subcommands.Add(ExportCommand.Create(cli));

        var parsed = root.Parse(args);
        if (parsed.Errors.Count > 0)
        {
            foreach (var problem in parsed.Errors)
            {
                error.WriteLine($"sweeps: {problem.Message}");
            }

            error.WriteLine("run 'sweeps --help' for usage");
            return ExitCodes.BadInput;
        }

        try
        {
            var invocation = new InvocationConfiguration
            {
                Output = output,
                Error = error,
                EnableDefaultExceptionHandler = false,

                // Ctrl-C and SIGTERM cancel the command's token; give a run time to stop its workers cleanly.
                ProcessTerminationTimeout = TimeSpan.FromSeconds(30),
            };
            return parsed.Invoke(invocation);
        }
        catch (ConfigException problems)
        {
            foreach (var problem in problems.Problems)
            {
                error.WriteLine(problem.ToString());
            }

            return ExitCodes.BadInput;
        }
        catch (Exception failure)
        {
            error.WriteLine($"sweeps: {failure.Message}");
            if (parsed.GetValue(verbose))
            {
                error.WriteLine(failure.ToString());
            }

            return ExitCodes.Failed;
        }
    }
}
