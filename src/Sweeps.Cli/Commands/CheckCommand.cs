using System.CommandLine;
using Sweeps.Cli.Output;
using Sweeps.Engine.Config;
using Sweeps.Engine.Planning;

namespace Sweeps.Cli.Commands;

/// <summary><c>sweeps check CONFIG</c>: validate and show the size and estimated cost of the sweep.</summary>
internal static class CheckCommand
{
    public static Command Create(TextWriter output)
    {
        var config = new Argument<string>("CONFIG") { Description = "The sweep config (TOML)" };
        var command = new Command("check", "Validate a config and print the grid size, chunk count, estimated cost and disk space; runs no sweep");
        command.Arguments.Add(config);
        command.SetAction(parse =>
        {
            var spec = SpecReader.Load(parse.GetRequiredValue(config));
            var model = Engine.Probing.ModelFactory.Build(spec);
            var estimate = CostEstimate.Measure(spec, model);
            // The chunks `run` would make on this machine.
            var plan = ChunkPlan.Of(spec, estimate.SecondsPerPoint, Environment.ProcessorCount, estimate.BlockSize, ChunkPlan.EmbeddedMinSeconds);
            DiskEstimate? disk = null;
            string? diskProblem = null;
            try
            {
                disk = DiskEstimate.Measure(spec, model, plan, estimate.SecondsPerPoint);
            }
            catch (Exception error) when (error is IOException or UnauthorizedAccessException)
            {
                // The sample parts go to the temporary folder; without one the rest of the report still stands.
                diskProblem = error.Message;
            }

            CheckText.Write(spec, estimate, disk, plan, Environment.ProcessorCount, output, diskProblem);
            return ExitCodes.Success;
        });
        return command;
    }
}
