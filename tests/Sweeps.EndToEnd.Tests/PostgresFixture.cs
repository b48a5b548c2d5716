using System.Diagnostics;
using Npgsql;

namespace Sweeps.EndToEnd.Tests;

/// <summary>
/// A real PostgreSQL for the distributed tests: the one .ci/run started (SWEEPS_TEST_POSTGRES and
/// SWEEPS_TEST_POSTGRES_DIR), or else a throwaway cluster started here with tools/pg-throwaway. Tests
/// are skipped, with the reason, only when the machine has no PostgreSQL binaries.
/// </summary>
public sealed class PostgresFixture : IDisposable
{
    private readonly bool ownServer;

    public PostgresFixture()
    {
        var given = Environment.GetEnvironmentVariable("SWEEPS_TEST_POSTGRES");
        DataDirectory = Environment.GetEnvironmentVariable("SWEEPS_TEST_POSTGRES_DIR");
        if (!string.IsNullOrEmpty(given) && !string.IsNullOrEmpty(DataDirectory))
        {
            ConnectionString = given;
            return;
        }

        DataDirectory = Path.Combine(Path.GetTempPath(), "sweeps-pg-" + Guid.NewGuid().ToString("N")[..8]);
        Directory.CreateDirectory(DataDirectory);
        var (code, output, error) = Script("start");
        if (code == 3)
        {
            SkipReason = "no PostgreSQL binaries (initdb, pg_ctl) on this machine: " + error.Trim();
            return;
        }

        if (code != 0)
        {
            throw new InvalidOperationException($"could not start a throwaway PostgreSQL: {error}");
        }

        ConnectionString = output.Trim();
        ownServer = true;
    }

    public string? ConnectionString { get; }

    public string? SkipReason { get; }

    public string? DataDirectory { get; }

    /// <summary>A fresh, empty database on the server, so tests never see each other's queues.</summary>
    public string NewDatabase()
    {
        var name = "sweeps_" + Guid.NewGuid().ToString("N")[..12];
        using (var connection = new NpgsqlConnection(ConnectionString))
        {
            connection.Open();
            using var command = new NpgsqlCommand($"CREATE DATABASE {name}", connection);
            command.ExecuteNonQuery();
        }

        return new NpgsqlConnectionStringBuilder(ConnectionString) { Database = name }.ConnectionString;
    }

    /// <summary>Stops the server, waits, and starts it again on the same port: a database outage.</summary>
    public void Outage(TimeSpan downtime)
    {
        NpgsqlConnection.ClearAllPools();
        var (code, _, error) = Script("stop");
        Assert.True(code == 0, error);
        Thread.Sleep(downtime);
        (code, _, error) = Script("start");
        Assert.True(code == 0, error);
    }

    public void Dispose()
    {
        if (ownServer)
        {
            Script("stop");
            try
            {
                Directory.Delete(DataDirectory!, recursive: true);
            }
            catch (IOException)
            {
            }
            catch (UnauthorizedAccessException)
            {
            }
        }
    }

    private (int Code, string Output, string Error) Script(string command)
    {
        var start = new ProcessStartInfo(Path.Combine(SweepsProcess.RepoRoot, "tools", "pg-throwaway"), [command, DataDirectory!])
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
        };
        using var process = Process.Start(start)!;
        var output = process.StandardOutput.ReadToEndAsync();
        var error = process.StandardError.ReadToEndAsync();
        process.WaitForExit();
        return (process.ExitCode, output.Result, error.Result);
    }
}

[CollectionDefinition("postgres")]
public sealed class PostgresCollection : ICollectionFixture<PostgresFixture>
{
}
