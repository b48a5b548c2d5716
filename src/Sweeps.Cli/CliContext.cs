namespace Sweeps.Cli;

/// <summary>What the commands may touch of the outside world, injected so that tests see it all.</summary>
internal sealed record CliContext(TextWriter Output, TextWriter Error, TimeProvider Clock, bool Interactive);
