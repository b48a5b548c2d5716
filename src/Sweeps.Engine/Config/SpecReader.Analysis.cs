using Sweeps.Core.Analysis;
using Sweeps.Engine.Specs;
using Sweeps.Core.Integrators;

namespace Sweeps.Engine.Config;

public static partial class SpecReader
{
    private static AnalysisSettings ReadAnalysis(ConfigReader reader, ConfigTable root)
    {
        var defaults = new AnalysisSettings();
        var table = reader.Table(root, "analysis", required: false);
        if (table is null)
        {
            return defaults;
        }

        reader.OnlyKeys(table, "transient", "measure", "lyapunov", "max_period", "tolerance", "escape", "zero_band", "samples");
        var maxPeriod = (int)(reader.Integer(table, "max_period", 1, 4096) ?? defaults.MaxPeriod);
        var measure = reader.Integer(table, "measure", 2, 10_000_000_000) ?? defaults.Measure;
        if (measure < 2 * maxPeriod && table.Find("measure") is { } entry)
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
            Samples: samples);
    }

    private static IntegratorSettings ReadIntegrator(ConfigReader reader, ConfigTable root)
    {
        var defaults = new IntegratorSettings();
        var table = reader.Table(root, "integrator", required: false);
        if (table is null)
        {
            return defaults;
        }

        reader.OnlyKeys(table, "method", "step", "rtol", "atol");
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
            reader.Number(table, "atol", a => a > 0, "must be > 0") ?? defaults.AbsoluteTolerance);
    }
}
