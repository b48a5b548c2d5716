using Sweeps.Core.Models;
using Sweeps.Engine.Probing;
using Sweeps.Engine.Runs;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Execution;

/// <summary>
/// Everything a worker needs to compute chunks of one run, built once per process: the spec read
/// back from the run directory (so every worker computes exactly what was submitted), the compiled
/// model, the part schema and the part-file metadata.
/// </summary>
public sealed class RunContext
{
    public RunContext(RunDirectory run)
        : this(run, null)
    {
    }

    /// <summary>
    /// A context whose model was already built from the same spec in this process (the run command's, which
    /// compiled it for the estimate): the compiled right-hand sides and block kernels are reused.
    /// </summary>
    public RunContext(RunDirectory run, Model? model)
    {
        Run = run;
        Spec = run.LoadSpec();
        Model = model ?? ModelFactory.Build(Spec);
        Schema = new PartSchema(Spec);
        AttractorSchema = new AttractorSchema(Spec);
        Metadata = new Dictionary<string, string>
        {
            ["sweeps.spec_hash"] = run.Manifest.SpecHash,
            ["sweeps.model_hash"] = run.Manifest.ModelHash,
            ["sweeps.version"] = run.Manifest.ProgramVersion,
            ["sweeps.samples_layout"] = string.Join(",", Spec.Model.Variables),
        };
    }

    public RunDirectory Run { get; }

    public SweepSpec Spec { get; }

    public Model Model { get; }

    public PartSchema Schema { get; }

    public AttractorSchema AttractorSchema { get; }

    /// <summary>Whether chunks write attractor parts: only when a point can have several outcomes (several starts, or a continuation sweep's two directions).</summary>
    public bool WritesAttractors => Spec.StartCount > 1 || Spec.Grid.Follow is not null;

    public IReadOnlyDictionary<string, string> Metadata { get; }
}
