using Sweeps.Engine.Execution;
using Sweeps.Engine.Runs;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Planning;

/// <summary>
/// Estimates the disk space of a run's part files by writing real parts: points spread evenly over the grid are
/// analysed as a chunk would analyse them (several starts, attractor rows and all), written once whole and once as
/// a single row, in the run's own format and compression. The difference gives the bytes per point, the single row
/// the fixed bytes of a part (schema, footer, counts); the total is points × bytes per point + parts × fixed bytes.
/// Compressibility varies across a grid (periodic samples repeat, chaotic ones do not), so the sample is spread over
/// all of it; docs/performance.md gives the accuracy measured on the bundled configs.
/// </summary>
public sealed record DiskEstimate(int SampledPoints, double BytesPerPoint, double BytesPerPart, double TotalBytes)
{
    /// <summary>At most this many points are analysed for the estimate, fewer when their analysis is slow.</summary>
    public const int MaxSample = 512;

    /// <param name="spec">The sweep.</param>
    /// <param name="model">Its model, already built.</param>
    /// <param name="plan">How the run cuts the grid: the number of parts.</param>
    /// <param name="secondsPerPoint">The cost of a point (from <see cref="CostEstimate"/>): the sample is sized to take about <paramref name="budgetSeconds"/>.</param>
    /// <param name="budgetSeconds">Time to spend on analysing the sample.</param>
    public static DiskEstimate Measure(SweepSpec spec, Core.Models.Model model, ChunkPlan plan, double secondsPerPoint, double budgetSeconds = 0.25)
    {
        var points = spec.Grid.PointCount;
        var affordable = secondsPerPoint > 0 ? (long)(budgetSeconds / (secondsPerPoint * spec.AnalysesPerPoint)) : MaxSample;
        var count = (int)Math.Clamp(Math.Min(affordable, MaxSample), Math.Min(32, points), Math.Min(points, MaxSample));
        var sample = Enumerable.Range(0, count).Select(i => count == 1 ? 0 : (long)Math.Round((double)i * (points - 1) / (count - 1))).Distinct().ToArray();

        var folder = Path.Combine(Path.GetTempPath(), $"sweeps-size-{Guid.NewGuid():N}");
        Directory.CreateDirectory(folder);
        try
        {
            var whole = Write(spec, model, sample, Path.Combine(folder, "whole"));
            var single = Write(spec, model, sample[..1], Path.Combine(folder, "single"));
            var perPoint = sample.Length > 1 ? Math.Max(0, (whole - single) / (sample.Length - 1.0)) : single;
            var perPart = Math.Max(0, single - perPoint);
            return new DiskEstimate(sample.Length, perPoint, perPart, (perPoint * points) + (perPart * plan.ChunkCount));
        }
        finally
        {
            Directory.Delete(folder, recursive: true);
        }
    }

    /// <summary>Bytes of the part (and attractor part, where the run writes them) holding <paramref name="points"/>.</summary>
    private static double Write(SweepSpec spec, Core.Models.Model model, long[] points, string path)
    {
        var (columns, attractors) = ChunkRunner.ComputeSample(spec, model, points);
        var metadata = RunContext.PartMetadata(spec, SpecFingerprint.SpecHash(spec), SpecFingerprint.ModelHash(spec.Model), ProgramInfo.Version);
        PartWriter.WriteAsync(path, new PartSchema(spec), columns, metadata, CancellationToken.None).GetAwaiter().GetResult();
        var bytes = (double)new FileInfo(path).Length;
        if (spec.GroupsAttractors)
        {
            var attractorPath = path + ".attractors";
            PartWriter.WriteAsync(attractorPath, new AttractorSchema(spec), attractors, metadata, CancellationToken.None).GetAwaiter().GetResult();
            bytes += new FileInfo(attractorPath).Length;
        }

        return bytes;
    }
}
