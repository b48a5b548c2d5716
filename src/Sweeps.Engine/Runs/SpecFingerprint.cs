using System.Globalization;
using System.Security.Cryptography;
using System.Text.Json;
using System.Text.Json.Nodes;
using Sweeps.Core.Analysis;
using Sweeps.Core.Expressions;
using Sweeps.Core.Models;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Runs;

/// <summary>
/// The normalised form of a spec — everything that decides a point's result and nothing else (not
/// the output directory, not the chunk size) — and its SHA-256. Equations are normalised by parsing
/// and printing them, so spacing and redundant parentheses do not change the hash; numbers are
/// written in round-trip form.
/// </summary>
public static class SpecFingerprint
{
    public static JsonObject Normalise(SweepSpec spec) => new()
    {
        ["model"] = NormaliseModel(spec.Model),
        ["initial"] = Values(spec.Model.Variables, spec.Initial, spec.Grid, AxisTarget.Variable),
        ["parameters"] = Values(spec.Model.Parameters, spec.Parameters, spec.Grid, AxisTarget.Parameter),
        ["grid"] = new JsonArray(spec.Grid.Axes.Select(Axis).ToArray()),
        ["follow"] = spec.Grid.Follow is { } follow ? spec.Grid.Axes[follow].Name : null,
        ["analysis"] = new JsonObject
        {
            ["transient"] = spec.Analysis.Transient,
            ["measure"] = spec.Analysis.Measure,
            ["lyapunov"] = spec.Analysis.Lyapunov.ToString().ToLowerInvariant(),
            ["max_period"] = spec.Analysis.MaxPeriod,
            ["tolerance"] = Number(spec.Analysis.Tolerance),
            ["escape"] = Number(spec.Analysis.Escape),
            ["zero_band"] = Number(spec.Analysis.ZeroBand),
            ["samples"] = spec.Analysis.Samples,
            ["transient_check"] = spec.Analysis.TransientCheck,
            ["indicators"] = spec.Analysis.Indicators,
            ["step_check"] = spec.Analysis.StepCheck,
        },
        ["integrator"] = spec.Model.Kind == ModelKind.Map ? null : new JsonObject
        {
            ["method"] = spec.Integrator.Method.ToString().ToLowerInvariant(),
            ["step"] = Number(spec.Integrator.Step),
            ["rtol"] = Number(spec.Integrator.RelativeTolerance),
            ["atol"] = Number(spec.Integrator.AbsoluteTolerance),
            ["min_step"] = Number(spec.Integrator.MinStep),
            ["max_step"] = Number(spec.Integrator.MaxStep),
            ["max_steps"] = spec.Integrator.MaxSteps,
        },
        ["section"] = spec.Model.Kind == ModelKind.Map || spec.Model.ForcingPeriod is not null ? null : new JsonObject
        {
            ["variable"] = spec.Model.Variables[(spec.Section ?? new SectionSettings()).Variable],
            ["value"] = (spec.Section ?? new SectionSettings()).Level is { } level ? Number(level) : "mean",
            ["direction"] = (spec.Section ?? new SectionSettings()).Direction.ToString().ToLowerInvariant(),
        },
        ["starts"] = spec.Starts is { } starts ? Starts(starts) : null,
    };

    private static JsonObject Starts(StartSpec starts) => new()
    {
        ["count"] = starts.Count,
        ["lattice"] = starts.Lattice is { } lattice ? new JsonArray(lattice.Axes.Select(Axis).ToArray()) : null,
        ["ranges"] = starts.Lattice is null
            ? new JsonArray(starts.Ranges.Select(r => (JsonNode)new JsonObject { ["variable"] = r.Variable, ["from"] = Number(r.From), ["to"] = Number(r.To) }).ToArray())
            : null,
        ["seed"] = starts.Lattice is null ? starts.Seed.ToString(CultureInfo.InvariantCulture) : null,
    };

    public static JsonObject NormaliseModel(ModelSource model)
    {
        var scope = new Scope(model.Variables, model.Parameters, model.Kind == ModelKind.Flow);
        var equations = new JsonObject();
        for (var i = 0; i < model.Variables.Count; i++)
        {
            equations[model.Variables[i]] = Parser.Parse(model.Equations[i], scope).ToString();
        }

        return new JsonObject
        {
            ["kind"] = model.Kind == ModelKind.Map ? "map" : "flow",
            ["variables"] = new JsonArray(model.Variables.Select(v => (JsonNode)v).ToArray()),
            ["parameters"] = new JsonArray(model.Parameters.Select(v => (JsonNode)v).ToArray()),
            ["equations"] = equations,
            ["forcing_period"] = model.ForcingPeriod is { } period ? Number(period) : null,
        };
    }

    public static string SpecHash(SweepSpec spec) => Hash(Normalise(spec));

    public static string ModelHash(ModelSource model) => Hash(NormaliseModel(model));

    /// <summary>SHA-256 of the node's compact JSON (<see cref="CompactJson"/>).</summary>
    private static string Hash(JsonNode node) => Convert.ToHexStringLower(SHA256.HashData(CompactJson.Utf8(node).Span));

    private static JsonObject Values(IReadOnlyList<string> names, IReadOnlyList<double> values, Grid grid, AxisTarget target)
    {
        var result = new JsonObject();
        for (var i = 0; i < names.Count; i++)
        {
            var swept = grid.Axes.Any(a => a.Target == target && a.Slot == i);
            result[names[i]] = swept ? "swept" : Number(values[i]);
        }

        return result;
    }

    private static JsonObject Axis(GridAxis axis) => axis.Values is { } values
        ? new JsonObject { ["name"] = axis.Name, ["values"] = new JsonArray(values.Select(v => (JsonNode)Number(v)).ToArray()) }
        : new JsonObject
        {
            ["name"] = axis.Name,
            ["from"] = Number(axis.From),
            ["to"] = Number(axis.To),
            ["steps"] = axis.Steps,
            ["spacing"] = axis.Spacing == AxisSpacing.Log ? "log" : "linear",
        };

    /// <summary>Numbers as round-trip strings, so that the hash never depends on a JSON writer's float formatting.</summary>
    private static JsonNode Number(double value) => value.ToString("R", CultureInfo.InvariantCulture);
}
