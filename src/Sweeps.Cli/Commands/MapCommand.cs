using System.CommandLine;
using Sweeps.Engine.Config;
using Sweeps.Engine.Runs;
using Sweeps.Maps;

namespace Sweeps.Cli.Commands;

/// <summary><c>sweeps map RUN [--color regime|period|lyapunov|attractor] [-o FILE.png] [--slice NAME=VALUE]…</c>: draw a run.</summary>
internal static class MapCommand
{
    public static Command Create(CliContext cli)
    {
        var runArgument = new Argument<string>("RUN") { Description = "A run directory" };
        var color = new Option<string>("--color") { Description = "What the colours show: regime, period, lyapunov or attractor (the same attractor keeps its colour across the grid)", DefaultValueFactory = _ => "regime" };
        color.AcceptOnlyFromAmong("regime", "period", "lyapunov", "attractor");
        var output = new Option<string?>("-o", "--output") { Description = "PNG file to write (default: RUN/map-<color>.png)" };
        var slice = new Option<string[]>("--slice") { Description = "Fix an axis beyond the two drawn, e.g. --slice b=0.3 (repeatable)" };
        var width = new Option<int>("--width") { Description = "Image width in pixels", DefaultValueFactory = _ => 1000 };
        var height = new Option<int>("--height") { Description = "Image height in pixels", DefaultValueFactory = _ => 700 };
        var command = new Command("map", "Draw a regime map (two axes) or a bifurcation diagram (one axis) from a run directory");
        command.Arguments.Add(runArgument);
        command.Options.Add(color);
        command.Options.Add(output);
        command.Options.Add(slice);
        command.Options.Add(width);
        command.Options.Add(height);
        command.SetAction(async (parse, token) =>
        {
            var run = RunDirectory.Open(parse.GetRequiredValue(runArgument));
            var mode = parse.GetValue(color) switch
            {
                "period" => ColorMode.Period,
                "lyapunov" => ColorMode.Lyapunov,
                "attractor" => ColorMode.Attractor,
                _ => ColorMode.Regime,
            };
            var (w, h) = (parse.GetValue(width), parse.GetValue(height));
            if (w is < 200 or > 8000 || h is < 150 or > 8000)
            {
                throw ConfigException.Single("--width/--height", $"{w}×{h} is out of range (200×150 to 8000×8000)");
            }

            var request = new MapRequest(mode, MapSlices.Parse(parse.GetValue(slice) ?? []), w, h);
            var path = parse.GetValue(output) ?? Path.Combine(run.FullPath, $"map-{parse.GetValue(color)}.png");
            byte[] png;
            try
            {
                png = await DrawAsync(run, request, token);
            }
            catch (ArgumentException error)
            {
                throw ConfigException.Single(run.FullPath, error.Message);
            }

            await File.WriteAllBytesAsync(path, png, token);
            cli.Output.WriteLine(path);
            return ExitCodes.Success;
        });
        return command;
    }

    /// <summary>A run is drawn part by part, its refinement levels after it: memory bounded by the picture, not the run.</summary>
    private static Task<byte[]> DrawAsync(RunDirectory run, MapRequest request, CancellationToken token) =>
        MapRenderer.RenderStreamedAsync(run, request, Path.GetFileName(run.FullPath), token);
}
