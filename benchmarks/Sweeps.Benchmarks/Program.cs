using BenchmarkDotNet.Running;
using Sweeps.Benchmarks;

// "direct CONFIG WORKERS": the baseline of tools/bench-run — the core analyzer over every grid point
// in a plain loop, no queue, no Parquet. Anything else goes to BenchmarkDotNet.
if (args.Length == 3 && args[0] == "direct")
{
    DirectLoop.Run(args[1], int.Parse(args[2], System.Globalization.CultureInfo.InvariantCulture));
    return;
}

BenchmarkSwitcher.FromAssembly(typeof(Program).Assembly).Run(args);
