using System.CommandLine;
using Sweeps.Cli.Output;
using Sweeps.Engine.Config;
using Sweeps.Engine.Probing;
using Sweeps.Engine.Specs;

namespace Sweeps.Cli.Commands;

/// <summary><c>sweeps probe CONFIG [--set NAME=VALUE]… [--json]</c>: analyse one point.</summary>
internal static class ProbeCommand
{
    public static Command Create(TextWriter output)
    {
        var config = new Argument<string>("CONFIG") { Description = "The sweep config (TOML)" };
        var set = new Option<string[]>("--set")
        {
            Description = "Set a parameter or initial value for this point, e.g. --set r=3.83 (repeatable)",
            AllowMultipleArgumentsPerToken = false,
        };
        var json = new Option<bool>("--json") { Description = "Print one JSON object instead of text" };
        var command = new Command("probe", "Analyse one point: regime, period, cycle, Lyapunov exponents, fixed points and their stability");
        command.Arguments.Add(config);
        command.Options.Add(set);
        command.Options.Add(json);
        command.SetAction(parse =>
        {
            var spec = SpecReader.Load(parse.GetRequiredValue(config));
            var point = PointOverrides.Apply(spec, parse.GetValue(set) ?? []);
            var report = PointProbe.Run(spec, point);
            if (parse.GetValue(json))
            {
                ProbeJson.Write(report, output);
            }
            else
            {
                ProbeText.Write(report, output);
            }

            return ExitCodes.Success;
        });
        return command;
    }
}
