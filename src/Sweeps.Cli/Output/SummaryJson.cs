using System.Text;
using System.Text.Json;
using Sweeps.Engine.Runs;

namespace Sweeps.Cli.Output;

/// <summary>The <c>inspect --json</c> and <c>status --json</c> objects.</summary>
internal static class SummaryJson
{
    public static void Write(RunDirectory run, RunSummary summary, TextWriter output, bool detailed, double rate = 0, Queue.QueueStatus? queue = null)
    {
        using var buffer = new MemoryStream();
        using (var json = new Utf8JsonWriter(buffer, new JsonWriterOptions { Indented = true }))
        {
            json.WriteStartObject();
            json.WriteString("run", run.FullPath);
            json.WriteString("state", summary.State);
            json.WriteNumber("points", summary.Points);
            json.WriteNumber("points_done", summary.PointsDone);
            json.WriteNumber("chunks", summary.Chunks);
            json.WriteNumber("chunks_done", summary.ChunksDone);
            json.WriteStartArray("missing_chunks");
            foreach (var chunk in summary.MissingChunks)
            {
                json.WriteNumberValue(chunk);
            }

            json.WriteEndArray();
            if (!detailed)
            {
                json.WriteNumber("points_per_second", rate);
            }

            if (queue is not null)
            {
                json.WriteStartObject("queue");
                json.WriteStartArray("running");
                foreach (var (chunk, server) in queue.Running)
                {
                    json.WriteStartObject();
                    json.WriteNumber("chunk", chunk);
                    json.WriteString("host", server);
                    json.WriteEndObject();
                }

                json.WriteEndArray();
                json.WriteNumber("queued", queue.Queued);
                json.WriteStartArray("failed");
                foreach (var (chunk, reason) in queue.Failed)
                {
                    json.WriteStartObject();
                    json.WriteNumber("chunk", chunk);
                    json.WriteString("reason", reason);
                    json.WriteEndObject();
                }

                json.WriteEndArray();

                // Missing chunks no job will compute (never queued, failed, or dropped by the queue): submit again.
                json.WriteStartArray("no_job");
                foreach (var chunk in queue.Unqueued(summary.MissingChunks))
                {
                    json.WriteNumberValue(chunk);
                }

                json.WriteEndArray();
                json.WriteStartArray("hosts");
                foreach (var (name, workers, heartbeat) in queue.Hosts)
                {
                    json.WriteStartObject();
                    json.WriteString("name", name);
                    json.WriteNumber("workers", workers);
                    json.WriteString("heartbeat", heartbeat?.ToString("O", System.Globalization.CultureInfo.InvariantCulture));
                    json.WriteEndObject();
                }

                json.WriteEndArray();
                json.WriteEndObject();
            }

            if (detailed)
            {
                json.WriteString("spec_hash", run.Manifest.SpecHash);
                json.WriteString("model_hash", run.Manifest.ModelHash);
                json.WriteString("program_version", run.Manifest.ProgramVersion);
                json.WriteStartObject("regimes");
                foreach (var (regime, count) in summary.Regimes)
                {
                    json.WriteNumber(regime, count);
                }

                json.WriteEndObject();
                json.WriteStartObject("periods");
                foreach (var (period, count) in summary.Periods)
                {
                    json.WriteNumber(period.ToString(System.Globalization.CultureInfo.InvariantCulture), count);
                }

                json.WriteEndObject();
                json.WriteNumber("multistable_points", summary.MultistablePoints);
                if (summary.HysteresisPoints is { } hysteretic)
                {
                    json.WriteNumber("hysteresis_points", hysteretic);
                }
                else
                {
                    json.WriteNull("hysteresis_points");
                }

                json.WritePropertyName("lyapunov_1_min");
                JsonNumbers.Write(json, summary.LargestExponentMin);
                json.WritePropertyName("lyapunov_1_max");
                JsonNumbers.Write(json, summary.LargestExponentMax);
            }

            json.WriteEndObject();
        }

        output.WriteLine(Encoding.UTF8.GetString(buffer.ToArray()));
    }
}
