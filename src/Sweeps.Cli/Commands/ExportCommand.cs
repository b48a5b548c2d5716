using System.CommandLine;
using Sweeps.Engine.Runs;

namespace Sweeps.Cli.Commands;

/// <summary><c>sweeps export RUN --format csv|parquet [-o PATH]</c>: the whole run as one file (streamed part by part).</summary>
internal static class ExportCommand
{
    public static Command Create(CliContext cli)
    {
        var runArgument = new Argument<string>("RUN") { Description = "A run directory" };
        var format = new Option<string>("--format") { Description = "csv or parquet (default: as the output's name ends, else parquet)", DefaultValueFactory = _ => "parquet" };
        format.AcceptOnlyFromAmong("csv", "parquet");
        var output = new Option<string?>("-o", "--output") { Description = "File to write (default: RUN/export.<format>; '-' for CSV on standard output)" };
        var command = new Command("export", "Write a whole run as one Parquet or CSV file");
        command.Arguments.Add(runArgument);
        command.Options.Add(format);
        command.Options.Add(output);
        command.SetAction(async (parse, token) =>
        {
            var run = RunDirectory.Open(parse.GetRequiredValue(runArgument));
            var chosen = parse.GetValue(output);
            var kind = Kind(parse.GetValue(format)!, parse.GetResult(format) is { Implicit: false }, chosen);
            var path = chosen ?? Path.Combine(run.FullPath, $"export.{kind}");
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

    /// <summary>
    /// The format to write: the one asked for, else the one the output's name implies (<c>.csv</c> or <c>-</c>: CSV,
    /// <c>.parquet</c>: Parquet), else Parquet. A format asked for that the name contradicts is refused rather than
    /// written under a misleading name.
    /// </summary>
    internal static string Kind(string requested, bool given, string? path)
    {
        var extension = path is null ? "" : Path.GetExtension(path);
        string? implied = path == "-" || extension.Equals(".csv", StringComparison.OrdinalIgnoreCase) ? "csv"
            : extension.Equals(".parquet", StringComparison.OrdinalIgnoreCase) ? "parquet"
            : null;
        if (!given)
        {
            return implied ?? requested;
        }

        if (implied is not null && implied != requested)
        {
            throw Engine.Config.ConfigException.Single("--format", $"{requested} was asked for, but the output '{path}' is named for {implied}");
        }

        return requested;
    }
}
