using System.Text;
using System.Text.Json;
using Sweeps.Engine.Runs;

namespace Sweeps.Cli.Output;

/// <summary>The <c>inspect --json</c> and <c>status --json</c> objects.</summary>
internal static class SummaryJson
{
    public static void Write(RunDirectory run, RunSummary summary, TextWriter output, bool detailed)
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
