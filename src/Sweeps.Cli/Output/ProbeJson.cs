using System.Text;
using System.Text.Json;
using Sweeps.Core.Analysis;
using Sweeps.Engine.Probing;

namespace Sweeps.Cli.Output;

/// <summary>The <c>probe --json</c> contract: one object, snake_case keys (see DESIGN.md).</summary>
internal static class ProbeJson
{
    public static void Write(ProbeReport report, TextWriter output)
    {
        var model = report.Model;
        var result = report.Result;
        using var buffer = new MemoryStream();
        using (var json = new Utf8JsonWriter(buffer, new JsonWriterOptions { Indented = true }))
        {
            json.WriteStartObject();
            json.WriteString("kind", model.Kind == Core.Models.ModelKind.Map ? "map" : "flow");
            JsonNumbers.WriteObject(json, "parameters", model.Parameters, report.Parameters);
            JsonNumbers.WriteObject(json, "initial", model.Variables, report.Initial);
            json.WriteString("regime", result.Regime.ToText());
            json.WriteNumber("period", result.Period);
            json.WritePropertyName("period_time");
            JsonNumbers.Write(json, result.PeriodTime);
            json.WriteStartArray("cycle");
            foreach (var point in result.Cycle)
            {
                JsonNumbers.WriteArray(json, null, point);
            }

            json.WriteEndArray();
            JsonNumbers.WriteArray(json, "lyapunov", result.Lyapunov);
            JsonNumbers.WriteArray(json, "lyapunov_error", result.LyapunovError);
            json.WritePropertyName("lyapunov_sum");
            JsonNumbers.Write(json, result.Lyapunov.Length == 0 ? double.NaN : result.Lyapunov.Sum());
            json.WritePropertyName("mean_log_det");
            JsonNumbers.Write(json, result.LogDetMean);
            JsonNumbers.WriteArray(json, "final_state", result.FinalState);
            if (result.DivergedAt is { } step)
            {
                json.WriteNumber("diverged_at", step);
            }
            else
            {
                json.WriteNull("diverged_at");
            }

            json.WriteString("reason", result.Reason);
            if (result.Indicators is { } indicators)
            {
                json.WriteStartObject("indicators");
                json.WritePropertyName("zero_one_k");
                JsonNumbers.Write(json, indicators.K);
                json.WritePropertyName("permutation_entropy");
                JsonNumbers.Write(json, indicators.PermutationEntropy);
                json.WritePropertyName("lz_complexity");
                JsonNumbers.Write(json, indicators.LempelZiv);
                json.WriteEndObject();
            }
            else
            {
                json.WriteNull("indicators");
            }
            json.WriteStartArray("fixed_points");
            foreach (var point in report.FixedPoints)
            {
                json.WriteStartObject();
                JsonNumbers.WriteArray(json, "state", point.State);
                json.WriteStartArray("eigenvalues");
                foreach (var mu in point.Eigenvalues)
                {
                    json.WriteStartObject();
                    json.WriteNumber("re", mu.Real);
                    json.WriteNumber("im", mu.Imaginary);
                    json.WriteEndObject();
                }

                json.WriteEndArray();
                json.WriteString("stability", FixedPointClassifier.Describe(point.Kind, model.Kind));
                json.WriteBoolean("stable", point.IsStable);
                json.WriteEndObject();
            }

            json.WriteEndArray();
            json.WriteStartArray("attractors");
            foreach (var attractor in report.Attractors)
            {
                json.WriteStartObject();
                json.WriteNumber("id", attractor.Id);
                json.WriteString("regime", attractor.Result.Regime.ToText());
                json.WriteNumber("period", attractor.Result.Period);
                json.WriteNumber("basin_fraction", attractor.BasinFraction);
                json.WriteNumber("start_count", attractor.Starts);
                json.WriteNumber("first_start", attractor.FirstStart);
                JsonNumbers.WriteArray(json, "state", attractor.Signature.State);
                JsonNumbers.WriteArray(json, "lyapunov", attractor.Result.Lyapunov);
                json.WriteString("reason", attractor.Result.Reason);
                json.WriteEndObject();
            }

            json.WriteEndArray();
            json.WriteStartArray("notes");
            foreach (var note in report.Notes)
            {
                json.WriteStringValue(note);
            }

            json.WriteEndArray();
            json.WriteEndObject();
        }

        output.WriteLine(Encoding.UTF8.GetString(buffer.ToArray()));
    }
}
