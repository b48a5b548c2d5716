using System.CommandLine;
using Sweeps.Engine.Runs;

namespace Sweeps.Cli.Commands;

/// <summary><c>sweeps export RUN --format csv|parquet [-o PATH]</c>: the whole run as one file (streamed part by part).</summary>
internal static class ExportCommand
{
    public static Command Create(CliContext cli)
    {
        var runArgument = new Argument<string>("RUN") { Description = "A run directory" };
        var format = new Option<string>("--format") { Description = "csv or parquet", DefaultValueFactory = _ => "parquet" };
        format.AcceptOnlyFromAmong("csv", "parquet");
        var output = new Option<string?>("-o", "--output") { Description = "File to write (default: RUN/export.<format>; '-' for CSV on standard output)" };
        var command = new Command("export", "Write a whole run as one Parquet or CSV file");
        command.Arguments.Add(runArgument);
        command.Options.Add(format);
        command.Options.Add(output);
        command.SetAction(async (parse, token) =>
        {
            var run = RunDirectory.Open(parse.GetRequiredValue(runArgument));
            var kind = parse.GetValue(format)!;
            var path = parse.GetValue(output) ?? Path.Combine(run.FullPath, $"export.{kind}");
            if (kind == "csv" && path == "-")
            {
                await RunExport.CsvAsync(run, cli.Output, token);
                return ExitCodes.Success;
            }

            long rows;
            if (kind == "csv")
            {
                await using var writer = new StreamWriter(path);
                rows = await RunExport.CsvAsync(run, writer, token);
            }
            else
            {
                rows = await RunExport.ParquetAsync(run, path, token);
            }

            cli.Error.WriteLine($"{rows:N0} rows written to {path}");
            cli.Output.WriteLine(path);
            return ExitCodes.Success;
        });
        return command;
    }
}
