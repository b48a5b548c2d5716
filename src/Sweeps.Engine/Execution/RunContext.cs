using System.Collections.Concurrent;
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
        GroupRows = ChunkColumns.GroupRows(Spec);
        AttractorSchema = new AttractorSchema(Spec);
        Metadata = PartMetadata(Spec, run.Manifest.SpecHash, run.Manifest.ModelHash, run.Manifest.ProgramVersion);
    }

    /// <summary>The key–value metadata every part file of a run carries (part of the output contract).</summary>
    internal static Dictionary<string, string> PartMetadata(SweepSpec spec, string specHash, string modelHash, string version) => new()
    {
        ["sweeps.spec_hash"] = specHash,
        ["sweeps.model_hash"] = modelHash,
        ["sweeps.version"] = version,
        ["sweeps.samples_layout"] = string.Join(",", spec.Model.Variables),
    };

    public RunDirectory Run { get; }

    public SweepSpec Spec { get; }

    public Model Model { get; }

    public PartSchema Schema { get; }

    public AttractorSchema AttractorSchema { get; }

    /// <summary>Whether chunks write attractor parts: only when a point can have several outcomes (several starts, or a continuation sweep's two directions).</summary>
    public bool WritesAttractors => Spec.GroupsAttractors;

    public IReadOnlyDictionary<string, string> Metadata { get; }

    // Columns of written row groups, kept for the next chunk: they are large arrays (a quarter of a megabyte each), and
    // fresh ones cost page faults, zeroing and collections of the large-object heap. At most one set per worker is in
    // use at a time, so the pool holds at most that many.
    private readonly ConcurrentBag<ChunkColumns> spareColumns = [];

    /// <summary>Rows in a row group of this run's parts (<see cref="ChunkColumns.GroupRows"/>).</summary>
    internal int GroupRows { get; init; }

    /// <summary>
    /// Empty columns for a row group of a chunk of <paramref name="count"/> points (the chunk's rows, or
    /// <see cref="GroupRows"/> of them): a returned set when one is big enough.
    /// </summary>
    internal ChunkColumns RentColumns(int count)
    {
        var rows = Math.Min(count, GroupRows);
        if (spareColumns.TryTake(out var columns) && columns.Capacity >= rows)
        {
            columns.Clear();
            return columns;
        }

        return ChunkColumns.For(Spec, rows, branches: Spec.Grid.Follow is not null);
    }

    private readonly ConcurrentDictionary<long, PartTally> written = new();

    /// <summary>
    /// The counts of the parts this process wrote, by chunk (each part's footer holds the same): the run's summary takes
    /// them from here instead of opening every part again.
    /// </summary>
    internal IReadOnlyDictionary<long, PartTally> WrittenTallies => written;

    internal void Wrote(long chunk, PartTally tally) => written[chunk] = tally;

    /// <summary>Gives back columns whose part is written (their contents are no longer needed).</summary>
    internal void ReturnColumns(ChunkColumns columns)
    {
        if (columns.Capacity == Math.Min(Run.Manifest.ChunkSize, GroupRows))
        {
            spareColumns.Add(columns);
        }
    }
}
