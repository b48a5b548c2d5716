using System.CommandLine;
using System.Diagnostics;
using Hangfire;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Sweeps.Cli.Output;
using Sweeps.Engine.Config;
using Sweeps.Engine.Execution;
using Sweeps.Engine.Planning;
using Sweeps.Engine.Runs;
using Sweeps.Engine.Specs;
using Sweeps.Queue;

namespace Sweeps.Cli.Commands;

/// <summary>
/// <c>sweeps run CONFIG [--out DIR] [--workers N] [--set …]</c>: the embedded run. Creates the run
/// directory (or resumes the one a previous run of the same spec left), queues every missing chunk on
/// the in-process Hangfire queue, shows progress and ends with the counts per regime. Stopping it
/// (Ctrl-C, SIGTERM) keeps the finished parts; in-flight chunks leave nothing behind.
/// </summary>
internal static class RunCommand
{
    public static Command Create(CliContext cli)
    {
        var config = new Argument<string>("CONFIG") { Description = "The sweep config (TOML)" };
        var outDir = new Option<string?>("--out") { Description = "Run directory (default: [output] dir, else runs/<config name>)" };
        var workers = new Option<int?>("--workers") { Description = "Worker threads (default: the number of cores)" };
        var set = new Option<string[]>("--set") { Description = "Set a parameter or initial value that is not swept, e.g. --set h=0.2 (repeatable)" };
        var command = new Command("run", "Run a sweep on this machine; run it again on the same directory to resume");
        command.Arguments.Add(config);
        command.Options.Add(outDir);
        command.Options.Add(workers);
        command.Options.Add(set);
        command.SetAction(async (parse, token) =>
        {
            var count = SweepSetup.Workers(parse.GetValue(workers));
            var path = parse.GetRequiredValue(config);
            var overrides = parse.GetValue(set) ?? [];

            // Building the queue host, and the first job submission and Parquet write of the process, cost a few
            // hundred milliseconds of compilation: done on other threads while this one reads, plans and estimates.
            var warm = Task.Run(() =>
            {
                var host = QueueHost.Build(new QueueSettings(count));
                ChunkQueue.WarmUp(host.Services.GetRequiredService<JobStorage>(), host.Services.GetRequiredService<IBackgroundJobClient>());
                return host;
            });
            var writer = Task.CompletedTask;
            try
            {
                var spec = SweepSetup.Load(path, overrides);
                writer = Task.Run(() => WarmUpWriterAsync(spec));
                var setup = SweepSetup.Prepare(spec, path, overrides, parse.GetValue(outDir), count, ChunkPlan.EmbeddedMinSeconds);
                return await RunAsync(cli, setup, warm, count, token);
            }
            finally
            {
                (await warm).Dispose();
                await writer;
            }
        });
        return command;
    }

    private static async Task WarmUpWriterAsync(SweepSpec spec)
    {
        // The spec's fingerprint and the manifest's serialiser first (the run directory needs them next), then the Parquet writer.
        RunDirectory.WarmUp(spec);
        try
        {
            await PartWriter.WarmUpAsync(spec);
        }
        catch (Exception error) when (error is IOException or UnauthorizedAccessException)
        {
            // Only a head start: without a writable temporary folder the first part compiles the writer itself.
        }
    }

    private static async Task<int> RunAsync(CliContext cli, SweepSetup setup, Task<IHost> warm, int workers, CancellationToken token)
    {
        var output = cli.Output;
        var estimate = setup.Estimate;
        var (run, resumed) = RunDirectory.CreateOrResume(setup.Directory, setup.Spec, setup.ConfigText, setup.Overrides, setup.ChunkSize, cli.Clock);
        var missing = run.MissingChunks();
        var manifest = run.Manifest;
        var pointsToRun = missing.Sum(chunk => Math.Min(manifest.ChunkSize, manifest.Points - (chunk * manifest.ChunkSize)));
        SummaryText.Line(output, "run", run.FullPath);
        SummaryText.Line(output, "points", $"{manifest.Points:N0} in {manifest.ChunkCount:N0} chunk{(manifest.ChunkCount == 1 ? "" : "s")} of up to {manifest.ChunkSize:N0}");
        if (resumed)
        {
            SummaryText.Line(output, "resuming", $"{manifest.ChunkCount - missing.Count:N0} chunks already done, {missing.Count:N0} to run");
        }

        if (estimate is not null)
        {
            var seconds = estimate.SecondsPerPoint * pointsToRun / workers;
            SummaryText.Line(output, "estimate", $"about {Numbers.Format(seconds, "g3")} s on {workers} worker{(workers == 1 ? "" : "s")}");
        }

        var clock = Stopwatch.StartNew();
        var context = new RunContext(run, setup.Model);
        var stopping = Task.CompletedTask;
        if (missing.Count > 0)
        {
            (var stopped, stopping) = await ComputeAsync(cli, await warm, context, missing, pointsToRun, token);
            if (stopped is { } code)
            {
                return code;
            }
        }

        // The computing time, the queue's start included; reading the summary back is not computing.
        var computing = clock.Elapsed.TotalSeconds;
        run.MarkFinished(cli.Clock);
        var summary = await RunSummary.ReadAsync(context, CancellationToken.None);
        var rate = computing > 0 ? pointsToRun / computing : 0;
        SummaryText.Line(output, "finished", $"{pointsToRun:N0} points computed in {Numbers.Format(computing, "g3")} s ({rate:N0} points/s)");
        SummaryText.Line(output, "regimes", SummaryText.Regimes(summary));
        SummaryText.Line(output, "periods", SummaryText.Periods(summary));
        SummaryText.Multistability(output, summary);
        await stopping;
        return ExitCodes.Success;
    }

    /// <summary>
    /// Computes the missing chunks on the embedded queue; returns an exit code if the run did not complete, and the
    /// queue's stop — still going when every chunk is done, so that the run closes while the idle workers stop.
    /// </summary>
    private static async Task<(int? Code, Task Stopping)> ComputeAsync(CliContext cli, IHost host, RunContext context, IReadOnlyList<long> missing, long pointsToRun, CancellationToken token)
    {
        var run = context.Run;
        host.Services.GetRequiredService<RunContexts>().Add(context);
        var counters = host.Services.GetRequiredService<RunProgress>().For(run.FullPath);
        ChunkQueue.Submit(host.Services.GetRequiredService<JobStorage>(), host.Services.GetRequiredService<IBackgroundJobClient>(), run.FullPath, missing);
        await host.StartAsync(CancellationToken.None);
        bool Pending() => counters.ChunksDone + counters.ChunksFailed < missing.Count;
        await ProgressView.Create(cli.Output, cli.Interactive).ShowAsync(pointsToRun, () => counters.Points, Pending, () => counters.NextChunk, token);
        var stopping = host.StopAsync(CancellationToken.None);
        if (!Pending() && counters.ChunksFailed == 0)
        {
            return (null, stopping);
        }

        await stopping;
        if (token.IsCancellationRequested && Pending())
        {
            var done = run.Manifest.ChunkCount - run.MissingChunks().Count;
            cli.Error.WriteLine($"stopped: {done:N0} of {run.Manifest.ChunkCount:N0} chunks are done and kept; run the same command again to resume");
            return (ExitCodes.Failed, stopping);
        }

        if (counters.ChunksFailed > 0)
        {
            foreach (var failure in counters.Failures)
            {
                cli.Error.WriteLine($"failed: {failure}");
            }

            cli.Error.WriteLine($"{counters.ChunksFailed} chunk(s) failed; the others are kept; fix the cause and run again to resume");
            return (ExitCodes.Failed, stopping);
        }

        return (null, stopping);
    }
}
