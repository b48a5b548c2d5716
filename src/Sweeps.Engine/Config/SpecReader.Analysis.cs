using Sweeps.Core.Analysis;
using Sweeps.Core.Integrators;
using Sweeps.Core.Models;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Config;

public static partial class SpecReader
{
    /// <summary>Defaults: maps count iterations; flows measure time and compare section points more loosely, as integration has its own error.</summary>
    private static AnalysisSettings Defaults(ModelKind kind) => kind == ModelKind.Map
        ? new AnalysisSettings()
        : new AnalysisSettings(Transient: 200, Measure: 1000, Tolerance: 1e-6, ZeroBand: 5e-3);

    private static AnalysisSettings ReadAnalysis(ConfigReader reader, ConfigTable root, ModelKind kind)
    {
        var defaults = Defaults(kind);
        var table = reader.Table(root, "analysis", required: false);
        if (table is null)
        {
            return defaults;
        }

        reader.OnlyKeys(table, "transient", "measure", "lyapunov", "max_period", "tolerance", "escape", "zero_band", "samples", "transient_check", "step_check", "indicators", "starts");
        var maxPeriod = (int)(reader.Integer(table, "max_period", 1, 4096) ?? defaults.MaxPeriod);
        var measure = reader.Integer(table, "measure", 2, 10_000_000_000) ?? defaults.Measure;
        if (kind == ModelKind.Map && measure < 2 * maxPeriod && table.Find("measure") is { } entry)
        {
            reader.Problem(entry.Value.Position, $"analysis.measure: {measure} is shorter than 2 × max_period = {2 * maxPeriod} (a cycle must be seen twice)");
        }

        var mode = reader.String(table, "lyapunov", required: false, "spectrum", "largest", "none") switch
        {
            "largest" => LyapunovMode.Largest,
            "none" => LyapunovMode.None,
            _ => LyapunovMode.Spectrum,
        };
        var samples = (int)(reader.Integer(table, "samples", 0, 4096) ?? defaults.Samples);
        if (samples > 2 * maxPeriod && table.Find("samples") is { } samplesEntry)
        {
            reader.Problem(samplesEntry.Value.Position, $"analysis.samples: {samples} is more than 2 × max_period = {2 * maxPeriod} (the states kept per point)");
        }

        return new AnalysisSettings(
            Transient: reader.Integer(table, "transient", 0, 10_000_000_000) ?? defaults.Transient,
            Measure: measure,
            Lyapunov: mode,
            MaxPeriod: maxPeriod,
            Tolerance: reader.Number(table, "tolerance", t => t > 0 && t < 1, "between 0 and 1, exclusive") ?? defaults.Tolerance,
            Escape: reader.Number(table, "escape", e => e > 0, "must be > 0") ?? defaults.Escape,
            ZeroBand: reader.Number(table, "zero_band", z => z >= 0 && z < 1, "0 ≤ zero_band < 1") ?? defaults.ZeroBand,
            Samples: samples,
            TransientCheck: reader.Boolean(table, "transient_check") ?? defaults.TransientCheck,
            Indicators: reader.Boolean(table, "indicators") ?? defaults.Indicators,
            StepCheck: ReadStepCheck(reader, table, kind));
    }

    private static bool ReadStepCheck(ConfigReader reader, ConfigTable table, ModelKind kind)
    {
        var wanted = reader.Boolean(table, "step_check") ?? false;
        if (wanted && kind == ModelKind.Map)
        {
            reader.Problem(table.Find("step_check")!.Value.Position, "analysis.step_check: maps have no integration step (try transient_check)");
            return false;
        }

        return wanted;
    }

    private static IntegratorSettings ReadIntegrator(ConfigReader reader, ConfigTable root)
    {
        var defaults = new IntegratorSettings();
        var table = reader.Table(root, "integrator", required: false);
        if (table is null)
        {
            return defaults;
        }

        reader.OnlyKeys(table, "method", "step", "rtol", "atol", "min_step", "max_step", "max_steps");
        var method = reader.String(table, "method", required: false, "euler", "rk4", "dopri5") switch
        {
            "euler" => IntegratorMethod.Euler,
            "rk4" => IntegratorMethod.Rk4,
            _ => IntegratorMethod.Dopri5,
        };
        return new IntegratorSettings(
            method,
            reader.Number(table, "step", s => s > 0, "must be > 0") ?? defaults.Step,
            reader.Number(table, "rtol", r => r > 0 && r < 1, "between 0 and 1, exclusive") ?? defaults.RelativeTolerance,
            reader.Number(table, "atol", a => a > 0, "must be > 0") ?? defaults.AbsoluteTolerance,
            reader.Number(table, "min_step", a => a > 0, "must be > 0") ?? defaults.MinStep,
            reader.Number(table, "max_step", a => a > 0, "must be > 0") ?? defaults.MaxStep,
            reader.Integer(table, "max_steps", 1, long.MaxValue) ?? defaults.MaxSteps);
    }

    private static SectionSettings ReadSection(ConfigReader reader, ConfigTable root, ModelSource? model)
    {
        var table = reader.Table(root, "section", required: false);
        if (table is null || model is null)
        {
            return new SectionSettings();
        }

        reader.OnlyKeys(table, "variable", "value", "direction");
        var usesTime = model.ForcingPeriod is not null;
        if (model.Kind == ModelKind.Map || usesTime)
        {
            var why = model.Kind == ModelKind.Map ? "a map is sampled every iteration" : "a forced flow is sampled once per forcing period";
            reader.Problem(table.Position, $"section: only autonomous flows take a Poincaré section; {why}");
            return new SectionSettings();
        }

        var variable = 0;
        if (reader.String(table, "variable", required: false) is { } name)
        {
            variable = IndexOf(model.Variables, name);
            if (variable < 0)
            {
                var suggestion = Core.Expressions.NameSuggester.Closest(name, model.Variables);
                var hint = suggestion is null ? $" (variables: {List(model.Variables)})" : $" (did you mean '{suggestion}'?)";
                reader.Problem(table.Find("variable")!.Value.Position, $"section.variable: '{name}' is not a variable{hint}");
                variable = 0;
            }
        }

        var direction = reader.String(table, "direction", required: false, "up", "down", "both") switch
        {
            "down" => SectionDirection.Down,
            "both" => SectionDirection.Both,
            _ => SectionDirection.Up,
        };
        return new SectionSettings(variable, reader.Number(table, "value", _ => true, ""), direction);
    }
}
