using Sweeps.Cli;

var interactive = !Console.IsOutputRedirected && Environment.GetEnvironmentVariable("TERM") is not (null or "dumb");
return CliApp.Run(args, new CliContext(Console.Out, Console.Error, TimeProvider.System, interactive));
