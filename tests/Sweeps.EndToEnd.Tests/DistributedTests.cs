using System.Diagnostics;

namespace Sweeps.EndToEnd.Tests;

/// <summary>
/// Sweeps on a real PostgreSQL queue with real worker processes (PostgreSQL tests: they need the
/// server that .ci/run starts, or start a throwaway one themselves).
/// </summary>
[Collection("postgres")]
public sealed class DistributedTests(PostgresFixture postgres)
{
    // 24 000 logistic-type points in 60 chunks of 400: several seconds of work for three workers. The transient
    // check keeps it on the scalar path, so that killed workers and outages land mid-sweep.
    private const string Config = """
        [model]
        kind = "map"
        variables = ["x"]
        parameters = ["r"]
        [model.equations]
        x = "r*x*(1 - x)"
        [initial]
        x = 0.3
        [grid]
        r = { from = 2.5, to = 4.0, steps = 24000 }
        [analysis]
        transient = 3000
        measure = 3000
        lyapunov = "largest"
        transient_check = true
        [output]
        chunk_size = 400
        """;

    [SkippableFact]
    public void PostgreSql_ThreeWorkersOneKilled_CompletesBitIdenticalToEmbedded()
    {
        Skip.If(postgres.SkipReason is not null, postgres.SkipReason);
        using var temp = new TempFolder();
        var (queue, config) = SubmitShared(temp);
        var workers = Enumerable.Range(0, 3).Select(_ => StartWorker(temp.Path, queue)).ToList();
        try
        {
            var parts = Path.Combine(temp.Path, "shared", "parts");
            WaitFor(() => Directory.GetFiles(parts, "*.parquet").Length >= 6, TimeSpan.FromMinutes(2));

            // SIGKILL, mid-chunk: the worker is always inside a chunk while there is work.
            workers[0].Kill();
            workers[0].WaitForExit();
            // The killed worker's chunk comes back after the invisibility timeout, and a lock it held expires after the
            // distributed-lock timeout (30 s each); on a loaded machine the survivors' retries back off further.
            WaitFor(() => Directory.GetFiles(parts, "*.parquet").Length == 60, TimeSpan.FromMinutes(6), () => $"{Directory.GetFiles(parts, "*.parquet").Length} of 60 parts; {QueueDump(queue)}");
        }
        finally
        {
            StopAll(workers);
        }

        var shared = IndependentReader.ReadRun(Path.Combine(temp.Path, "shared"));
        Assert.Equal(24000, shared.Rows.Count);
        Assert.Equal(Enumerable.Range(0, 24000).Select(i => (long)i), shared.Rows.Select(r => (long)r[0]!).Order());
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", config, "--out", "embedded").ExitCode);
        Assert.Equal(IndependentReader.ReadRun(Path.Combine(temp.Path, "embedded")).Hash(), shared.Hash());
        Assert.Contains("\"state\": \"finished\"", File.ReadAllText(Path.Combine(temp.Path, "shared", "run.json")));
    }

    [SkippableFact]
    public void PostgreSql_TwoRunsSubmittedAtOnce_BothComplete()
    {
        Skip.If(postgres.SkipReason is not null, postgres.SkipReason);
        using var temp = new TempFolder();
        var queue = postgres.NewDatabase();
        var first = temp.Write("first.toml", Config);
        var second = temp.Write("second.toml", Config.Replace("x = 0.3", "x = 0.6", StringComparison.Ordinal));
        var submits = new[] { (first, "one"), (second, "two") }
            .Select(s => SweepsProcess.Start(temp.Path, "submit", s.Item1, "--queue", queue, "--out", s.Item2))
            .ToList();
        foreach (var submit in submits)
        {
            submit.WaitForExit();
            Assert.Equal(0, submit.ExitCode);
        }

        // Submitting again while queued adds nothing.
        var again = SweepsProcess.Run(temp.Path, "submit", first, "--queue", queue, "--out", "one");
        Assert.Contains("0 queued now, 60 already queued", again.Error);

        var workers = Enumerable.Range(0, 2).Select(_ => StartWorker(temp.Path, queue)).ToList();
        try
        {
            WaitFor(
                () => Directory.GetFiles(Path.Combine(temp.Path, "one", "parts"), "*.parquet").Length == 60
                    && Directory.GetFiles(Path.Combine(temp.Path, "two", "parts"), "*.parquet").Length == 60,
                TimeSpan.FromMinutes(3),
                () => QueueDump(queue));
        }
        finally
        {
            StopAll(workers);
        }

        foreach (var name in new[] { "one", "two" })
        {
            var data = IndependentReader.ReadRun(Path.Combine(temp.Path, name));
            Assert.Equal(Enumerable.Range(0, 24000).Select(i => (long)i), data.Rows.Select(r => (long)r[0]!).Order());
        }

        Assert.NotEqual(
            IndependentReader.ReadRun(Path.Combine(temp.Path, "one")).Hash(),
            IndependentReader.ReadRun(Path.Combine(temp.Path, "two")).Hash());
    }

    [SkippableFact]
    public void PostgreSql_DatabaseOutageMidSweep_LosesAndDuplicatesNothing()
    {
        Skip.If(postgres.SkipReason is not null, postgres.SkipReason);
        using var temp = new TempFolder();
        var (queue, config) = SubmitShared(temp);
        var workers = Enumerable.Range(0, 2).Select(_ => StartWorker(temp.Path, queue)).ToList();
        var parts = Path.Combine(temp.Path, "shared", "parts");
        try
        {
            WaitFor(() => Directory.GetFiles(parts, "*.parquet").Length >= 4, TimeSpan.FromMinutes(2));
            postgres.Outage(TimeSpan.FromSeconds(3));
            // The killed worker's chunk comes back after the invisibility timeout, and a lock it held expires after the
            // distributed-lock timeout (30 s each); on a loaded machine the survivors' retries back off further.
            WaitFor(() => Directory.GetFiles(parts, "*.parquet").Length == 60, TimeSpan.FromMinutes(6), () => $"{Directory.GetFiles(parts, "*.parquet").Length} of 60 parts; {QueueDump(queue)}");
        }
        finally
        {
            StopAll(workers);
        }

        var shared = ReadEveryPoint(temp);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "run", config, "--out", "embedded").ExitCode);
        Assert.Equal(IndependentReader.ReadRun(Path.Combine(temp.Path, "embedded")).Hash(), shared.Hash());
    }

    [SkippableFact]
    public void PostgreSql_JobDroppedFromTheQueue_IsShownAndQueuedAgainBySubmit()
    {
        Skip.If(postgres.SkipReason is not null, postgres.SkipReason);
        using var temp = new TempFolder();
        var (queue, config) = SubmitShared(temp);

        // Nothing would ever compute chunk 0 now, and submitting again used to call it "already queued".
        DropFirstQueuedJob(queue);

        var status = SweepsProcess.Run(temp.Path, "status", "shared", "--queue", queue);
        Assert.Equal(0, status.ExitCode);
        Assert.Contains("no job        0: missing, and no job of theirs is waiting or running", status.Output);
        Assert.Equal([0L], QueueJson(temp, queue).GetProperty("no_job").EnumerateArray().Select(e => e.GetInt64()));

        var again = SweepsProcess.Run(temp.Path, "submit", config, "--queue", queue, "--out", "shared");
        Assert.Equal(0, again.ExitCode);
        Assert.Contains("1 queued now, 59 already queued", again.Error);
        Assert.Contains("1 of those queued now had been queued before", again.Error);

        ComputeShared(temp, queue);

        ReadEveryPoint(temp);
    }

    [SkippableFact]
    public void PostgreSql_FetchedJobs_AreLive()
    {
        Skip.If(postgres.SkipReason is not null, postgres.SkipReason);
        using var temp = new TempFolder();
        var (queue, config) = SubmitShared(temp);

        // Every job held by a worker (fetched, as workers whose servers are gone leave them until the invisibility
        // timeout hands them out again): none waits in the queue, yet every chunk will be computed.
        Assert.Equal(60, Sql(queue, "UPDATE sweeps.jobqueue SET fetchedat = now()"));

        Assert.Equal(0, QueueJson(temp, queue).GetProperty("no_job").GetArrayLength());

        var again = SweepsProcess.Run(temp.Path, "submit", config, "--queue", queue, "--out", "shared");
        Assert.Contains("0 queued now, 60 already queued", again.Error);
    }

    [SkippableFact]
    public void PostgreSql_JobProcessingWithoutItsQueueEntry_IsLost()
    {
        Skip.If(postgres.SkipReason is not null, postgres.SkipReason);
        using var temp = new TempFolder();
        var (queue, config) = SubmitShared(temp);

        // Chunk 0's job marked processing on a server that is alive, but its queue entry gone: on PostgreSQL a job keeps
        // its entry until it is done, so no worker is computing it and none ever will.
        Sql(
            queue,
            """
            INSERT INTO sweeps.server (id, data, lastheartbeat)
                VALUES ('ghost:1', '{"WorkerCount":1,"Queues":["default"],"StartedAt":"2026-12-03T06:00:00Z"}', now());
            WITH first AS (SELECT jobid FROM sweeps.jobqueue ORDER BY id LIMIT 1),
                 processing AS (INSERT INTO sweeps.state (jobid, name, createdat, data)
                     SELECT jobid, 'Processing', now(), '{"StartedAt":"1796278214973","ServerId":"ghost:1","WorkerId":"w1"}' FROM first RETURNING id, jobid)
            UPDATE sweeps.job SET statename = 'Processing', stateid = processing.id FROM processing WHERE job.id = processing.jobid;
            DELETE FROM sweeps.jobqueue WHERE id = (SELECT min(id) FROM sweeps.jobqueue);
            """);

        var status = SweepsProcess.Run(temp.Path, "status", "shared", "--queue", queue);
        Assert.True(status.ExitCode == 0, status.Error);
        Assert.Contains("0 on ghost:1", status.Output);
        Assert.Contains("no job        0: missing", status.Output);
        var again = SweepsProcess.Run(temp.Path, "submit", config, "--queue", queue, "--out", "shared");
        Assert.Contains("1 queued now, 59 already queued", again.Error);
    }

    [SkippableFact]
    public void PostgreSql_JobDroppedFromTheQueue_IsQueuedAgainByTheWorkers()
    {
        Skip.If(postgres.SkipReason is not null, postgres.SkipReason);
        using var temp = new TempFolder();
        var (queue, config) = SubmitShared(temp);
        DropFirstQueuedJob(queue);

        // Nobody submits again: a worker that has computed chunks of the run looks for lost ones every invisibility
        // timeout (15 s here) and queues chunk 0 again.
        ComputeShared(temp, queue);

        Assert.Contains(workerLog, line => line.Contains($"requeued: {Path.Combine(temp.Path, "shared")} chunk 0 (queued, but no job", StringComparison.Ordinal));
        ReadEveryPoint(temp);
    }

    [SkippableFact]
    public void PostgreSql_JobHeldUnstartedByAStuckWorker_IsQueuedAgainByTheWorkers()
    {
        Skip.If(postgres.SkipReason is not null, postgres.SkipReason);
        using var temp = new TempFolder();
        var (queue, _) = SubmitShared(temp);

        // Chunk 0's job taken by a worker that is alive but never starts it: its queue entry stays fetched, renewed
        // every second as the sliding invisibility timeout renews it, so the job never comes back to the queue. The
        // workers (invisibility 15 s) call a job held unstarted for four timeouts stalled and queue its chunk again.
        var row = Scalar(queue, "SELECT min(id) FROM sweeps.jobqueue");
        using var stuck = new CancellationTokenSource();
        var holder = Task.Run(async () =>
        {
            while (!stuck.IsCancellationRequested)
            {
                Assert.Equal(1, Sql(queue, $"UPDATE sweeps.jobqueue SET fetchedat = now() WHERE id = {row}"));
                await Task.Delay(TimeSpan.FromSeconds(1), CancellationToken.None);
            }
        });
        try
        {
            ComputeShared(temp, queue);
        }
        finally
        {
            stuck.Cancel();
            holder.Wait();
        }

        Assert.Contains(workerLog, line => line.Contains($"requeued: {Path.Combine(temp.Path, "shared")} chunk 0 (queued, but no job", StringComparison.Ordinal));
        ReadEveryPoint(temp);
    }

    [SkippableFact]
    public void PostgreSql_CancelledRun_IsNotComputed_UntilSubmittedAgain()
    {
        Skip.If(postgres.SkipReason is not null, postgres.SkipReason);
        using var temp = new TempFolder();
        var (queue, config) = SubmitShared(temp);

        var cancel = SweepsProcess.Run(temp.Path, "cancel", "shared", "--queue", queue);
        Assert.Equal(0, cancel.ExitCode);
        Assert.Contains("60 waiting jobs deleted, 0 running jobs told to stop", cancel.Output);
        var status = QueueJson(temp, queue);
        Assert.Equal(0, status.GetProperty("queued").GetInt64());
        Assert.Equal(60, status.GetProperty("no_job").GetArrayLength());

        // A worker takes the deleted jobs off the queue without computing them.
        var worker = StartWorker(temp.Path, queue);
        try
        {
            WaitFor(() => QueueRows(queue) == 0, TimeSpan.FromMinutes(1), () => $"{QueueRows(queue)} jobs still queued");
        }
        finally
        {
            StopAll([worker]);
        }

        Assert.Empty(Directory.GetFiles(Path.Combine(temp.Path, "shared", "parts"), "*.parquet"));
        var again = SweepsProcess.Run(temp.Path, "submit", config, "--queue", queue, "--out", "shared");
        Assert.Contains("60 queued now, 0 already queued", again.Error);

        // Forgotten by the queue: queued anew, not as lost jobs (which a worker would have queued again by itself).
        Assert.DoesNotContain("had been queued before", again.Error);
    }

    [SkippableFact]
    public void Submit_NeverPrintsThePassword()
    {
        Skip.If(postgres.SkipReason is not null, postgres.SkipReason);
        using var temp = new TempFolder();
        var config = temp.Write("stock.toml", Config);
        var withPassword = postgres.NewDatabase() + ";Password=hunter2-secret";
        var (code, output, error) = SweepsProcess.Run(temp.Path, "submit", config, "--queue", withPassword, "--out", "shared");
        Assert.Equal(0, code);
        Assert.DoesNotContain("hunter2-secret", output + error);
        Assert.Contains("Password=***", error);
        Assert.DoesNotContain("hunter2-secret", File.ReadAllText(Path.Combine(temp.Path, "shared", "run.json")));

        var unreachable = SweepsProcess.Run(temp.Path, "submit", config, "--queue", "Host=127.0.0.1;Port=1;Username=x;Password=hunter2-secret;Timeout=2", "--out", "other");
        Assert.Equal(1, unreachable.ExitCode);
        Assert.DoesNotContain("hunter2-secret", unreachable.Output + unreachable.Error);
        Assert.Contains("cannot use the queue at", unreachable.Error);
    }

    /// <summary>
    /// The queue loses chunk 0's job the way a worker gives a job up: its queue row removed, the job left in its state.
    /// </summary>
    private static void DropFirstQueuedJob(string queue) =>
        Assert.Equal(1, Sql(queue, "DELETE FROM sweeps.jobqueue WHERE id = (SELECT min(id) FROM sweeps.jobqueue)"));

    /// <summary>Runs SQL on the queue's database; returns the rows it changed.</summary>
    private static int Sql(string queue, string text) => Command(queue, text, command => command.ExecuteNonQuery());

    /// <summary>The first value a query on the queue's database gives.</summary>
    private static long Scalar(string queue, string text) =>
        Command(queue, text, command => Convert.ToInt64(command.ExecuteScalar(), System.Globalization.CultureInfo.InvariantCulture));

    private static T Command<T>(string queue, string text, Func<Npgsql.NpgsqlCommand, T> run)
    {
        using var connection = new Npgsql.NpgsqlConnection(queue);
        connection.Open();
        using var command = new Npgsql.NpgsqlCommand(text, connection);
        return run(command);
    }

    /// <summary>The "queue" object of <c>status shared --queue --json</c>.</summary>
    private static System.Text.Json.JsonElement QueueJson(TempFolder temp, string queue)
    {
        using var document = System.Text.Json.JsonDocument.Parse(SweepsProcess.Run(temp.Path, "status", "shared", "--queue", queue, "--json").Output);
        return document.RootElement.GetProperty("queue").Clone();
    }

    /// <summary>A fresh queue with the test config submitted to it as run "shared".</summary>
    private (string Queue, string Config) SubmitShared(TempFolder temp)
    {
        var queue = postgres.NewDatabase();
        var config = temp.Write("stock.toml", Config);
        Assert.Equal(0, SweepsProcess.Run(temp.Path, "submit", config, "--queue", queue, "--out", "shared").ExitCode);
        return (queue, config);
    }

    /// <summary>Two workers until run "shared" has all 60 parts (three minutes at most), then stopped.</summary>
    private void ComputeShared(TempFolder temp, string queue)
    {
        var workers = Enumerable.Range(0, 2).Select(_ => StartWorker(temp.Path, queue)).ToList();
        var parts = Path.Combine(temp.Path, "shared", "parts");
        try
        {
            WaitFor(() => Directory.GetFiles(parts, "*.parquet").Length == 60, TimeSpan.FromMinutes(3), () => $"{Directory.GetFiles(parts, "*.parquet").Length} of 60 parts; {QueueDump(queue)}");
        }
        finally
        {
            StopAll(workers);
        }
    }

    /// <summary>Run "shared" read back by the independent reader, checked to hold every point once.</summary>
    private static IndependentReader ReadEveryPoint(TempFolder temp)
    {
        var shared = IndependentReader.ReadRun(Path.Combine(temp.Path, "shared"));
        Assert.Equal(Enumerable.Range(0, 24000).Select(i => (long)i), shared.Rows.Select(r => (long)r[0]!).Order());
        return shared;
    }

    /// <summary>For a failure message: the jobs not done (state, queue row, fetched when) and the servers' heartbeats.</summary>
    private static string QueueDump(string queue)
    {
        try
        {
            using var connection = new Npgsql.NpgsqlConnection(queue);
            connection.Open();
            var lines = new List<string>();
            using (var jobs = new Npgsql.NpgsqlCommand(
                "SELECT j.id, j.statename, j.arguments, q.id, q.fetchedat FROM sweeps.job j LEFT JOIN sweeps.jobqueue q ON q.jobid = j.id "
                + "WHERE j.statename IS DISTINCT FROM 'Succeeded' ORDER BY j.id LIMIT 20", connection))
            using (var reader = jobs.ExecuteReader())
            {
                while (reader.Read())
                {
                    lines.Add($"job {reader.GetValue(0)} {reader.GetValue(1)} {reader.GetValue(2)} row {reader.GetValue(3)} fetched {reader.GetValue(4)}");
                }
            }

            using (var servers = new Npgsql.NpgsqlCommand("SELECT id, lastheartbeat FROM sweeps.server", connection))
            using (var reader = servers.ExecuteReader())
            {
                while (reader.Read())
                {
                    lines.Add($"server {reader.GetValue(0)} heartbeat {reader.GetValue(1)}");
                }
            }

            return $"now {DateTime.UtcNow:O}\n" + string.Join("\n", lines);
        }
        catch (Npgsql.NpgsqlException error)
        {
            return "queue unreadable: " + error.Message;
        }
    }

    private static long QueueRows(string queue) => Scalar(queue, "SELECT count(*) FROM sweeps.jobqueue");

    // What the workers print, read as it comes: an unread pipe fills up and stalls the worker writing to it.
    private readonly System.Collections.Concurrent.ConcurrentQueue<string> workerLog = new();

    private Process StartWorker(string folder, string queue)
    {
        // A killed worker's chunk comes back after the invisibility timeout. 15 s rather than 5: with the whole suite
        // running beside these tests, a chunk's keep-alive (every fifth of the timeout) could lapse, a second worker then
        // fetched a chunk still being computed, and twice in a row a run was left one chunk short with nothing failed.
        // The queue library's debug messages too: a failure below prints the workers' last lines.
        var worker = SweepsProcess.Start(folder, "worker", "--queue", queue, "--workers", "1", "--invisibility", "15", "--log", "debug");
        var id = worker.Id;
        worker.OutputDataReceived += (_, line) => Log(id, line.Data);
        worker.ErrorDataReceived += (_, line) => Log(id, line.Data);
        worker.BeginOutputReadLine();
        worker.BeginErrorReadLine();
        return worker;
    }

    private void Log(int worker, string? line)
    {
        // The servers' heartbeats, every five seconds each, would crowd out what a failure needs.
        if (line is not null && !line.Contains("heartbeat successfully sent", StringComparison.Ordinal))
        {
            workerLog.Enqueue($"[{worker}] {line}");
        }
    }

    private static void StopAll(List<Process> workers)
    {
        foreach (var worker in workers.Where(w => !w.HasExited))
        {
            using var term = Process.Start("kill", ["-TERM", worker.Id.ToString(System.Globalization.CultureInfo.InvariantCulture)]);
            term.WaitForExit();
        }

        foreach (var worker in workers)
        {
            if (!worker.WaitForExit(TimeSpan.FromSeconds(40)))
            {
                worker.Kill();
            }

            // The wait without a timeout also waits for the last lines to reach the output handlers.
            worker.WaitForExit();
            worker.Dispose();
        }
    }

    private void WaitFor(Func<bool> condition, TimeSpan timeout, Func<string>? state = null)
    {
        var clock = Stopwatch.StartNew();
        while (!condition())
        {
            Assert.True(clock.Elapsed < timeout, $"condition not met within {timeout} ({state?.Invoke() ?? "no state"}); the workers' last lines:\n{string.Join("\n", workerLog.TakeLast(120))}");
            Thread.Sleep(50);
        }
    }
}
