using Parquet;
using Parquet.Schema;
using Sweeps.Core.Analysis;
using Sweeps.Core.Attractors;

namespace Sweeps.Engine.Runs;

/// <summary>
/// One label per point for a basin picture: the attractor with the largest basin at each point (its
/// attractor 0), identified across the whole grid by <see cref="AttractorCatalog"/> in point order, so the
/// same attractor has the same label — and colour — wherever it is reached.
/// </summary>
public sealed class AttractorLabels
{
    private AttractorLabels(int[] label, IReadOnlyList<AttractorSignature> known, bool overflowed)
    {
        Label = label;
        Known = known;
        Overflowed = overflowed;
    }

    /// <summary>Per row of the run table (point order); <see cref="AttractorCatalog.Other"/> beyond the catalog's capacity, −2 for a point with no attractor row.</summary>
    public int[] Label { get; }

    /// <summary>The attractor behind each label.</summary>
    public IReadOnlyList<AttractorSignature> Known { get; }

    public bool Overflowed { get; }

    /// <summary>The label of a point missing from the attractors table (a chunk not yet finished).</summary>
    public const int Missing = -2;

    internal static async Task<AttractorLabels> ReadAsync(RunDirectory run, long[] points, CancellationToken token)
    {
        // Every part's attractors in part order (the catalog numbers them as it meets them), then the points asked for.
        var labeller = new Labeller(run);
        var byPoint = new Dictionary<long, int>();
        foreach (var part in labeller.Parts())
        {
            await labeller.LabelAsync(part, byPoint, token);
        }

        return labeller.For(points, byPoint);
    }

    /// <summary>
    /// Labels a run's points part by part, one catalog for the whole run: parts given in part order get the labels the
    /// whole run read at once gives them (<see cref="ReadAsync"/>), so a picture can be drawn one part at a time.
    /// </summary>
    internal sealed class Labeller
    {
        private readonly RunDirectory run;
        private readonly Specs.SweepSpec spec;
        private readonly AttractorCatalog catalog;

        public Labeller(RunDirectory run)
        {
            this.run = run;
            spec = run.LoadSpec();
            catalog = new AttractorCatalog(spec.Analysis.Tolerance, spec.Analysis.ZeroBand);
        }

        /// <summary>The files that name the attractors, in part order: attractor parts where a run groups starts, else its point parts.</summary>
        public IEnumerable<string> Parts()
        {
            var folder = spec.GroupsAttractors ? run.AttractorPartsPath : run.PartsPath;
            return Directory.Exists(folder) ? Directory.EnumerateFiles(folder, "part-*.parquet").Order(StringComparer.Ordinal) : [];
        }

        /// <summary>The labels of the points of the point part <paramref name="pointPart"/> (its rows, in the order given).</summary>
        public async Task<AttractorLabels> LabelPartAsync(string pointPart, long[] points, CancellationToken token)
        {
            var byPoint = new Dictionary<long, int>(points.Length);
            var part = spec.GroupsAttractors ? Path.Combine(run.AttractorPartsPath, Path.GetFileName(pointPart)) : pointPart;
            if (File.Exists(part))
            {
                await LabelAsync(part, byPoint, token);
            }

            return For(points, byPoint);
        }

        public AttractorLabels For(long[] points, Dictionary<long, int> byPoint) =>
            new(points.Select(p => byPoint.TryGetValue(p, out var label) ? label : Missing).ToArray(), catalog.Known, catalog.Overflowed);

        /// <summary>Labels the attractors one file of <see cref="Parts"/> names, by point.</summary>
        public Task LabelAsync(string part, Dictionary<long, int> byPoint, CancellationToken token) =>
            spec.GroupsAttractors ? FromAttractorsAsync(part, byPoint, token) : FromPointsAsync(part, byPoint, token);

        private async Task FromAttractorsAsync(string part, Dictionary<long, int> byPoint, CancellationToken token)
        {
            var variables = spec.Model.Variables;
            await using var reader = await ParquetReader.CreateAsync(part, null, token);
            var fields = reader.Schema.DataFields;
            DataField Field(string name) => fields.First(f => f.Name == name);
            for (var g = 0; g < reader.RowGroupCount; g++)
            {
                using var group = reader.OpenRowGroupReader(g);
                var rows = (int)group.RowCount;
                var point = await RunTable.Read<long>(group, Field("point"), rows, token);
                var id = await RunTable.Read<int>(group, Field("attractor"), rows, token);
                var regime = new string[rows];
                await group.ReadAsync(Field("regime"), regime, null, token);
                var period = await RunTable.Read<int>(group, Field("period"), rows, token);
                var exponent = await RunTable.Read<double>(group, Field("lyapunov_1"), rows, token);
                var error = await RunTable.Read<double>(group, Field("lyapunov_error_1"), rows, token);
                var state = await Columns(group, Field, "state_", variables, rows, token);
                var low = await Columns(group, Field, "low_", variables, rows, token);
                var high = await Columns(group, Field, "high_", variables, rows, token);
                for (var r = 0; r < rows; r++)
                {
                    if (id[r] != 0)
                    {
                        continue;
                    }

                    var signature = new AttractorSignature(
                        RegimeNames.TryParse(regime[r], out var parsed) ? parsed : Regime.Unresolved, period[r], Row(state, r), new StateBox(Row(low, r), Row(high, r)), exponent[r], error[r]);
                    byPoint[point[r]] = catalog.Label(signature);
                }
            }
        }

        /// <summary>
        /// One start per point: no attractor table is written, and each point's own row describes its attractor —
        /// the cycle from its last samples (when they hold one whole period), the box from its samples.
        /// </summary>
        private async Task FromPointsAsync(string part, Dictionary<long, int> byPoint, CancellationToken token)
        {
            var n = spec.Model.Variables.Count;

            // A row group at a time: memory bounded by a row group, however many samples a point keeps.
            await foreach (var columns in PartReader.ReadGroupsAsync(part, new PartSchema(spec), token))
            {
                var cursor = new ChunkColumns.SampleCursor(columns);
                var samples = new List<double>();
                for (var row = 0; row < columns.Count; row++)
                {
                    cursor.Next(samples);

                    var states = Enumerable.Range(0, samples.Count / n).Select(i => samples.GetRange(i * n, n).ToArray()).ToList();
                    var period = columns.Period[row];
                    var cycle = period > 0 && states.Count >= period ? states.GetRange(states.Count - period, period) : [];
                    var final = columns.Final.Select(f => f[row]).ToArray();
                    var result = new PointResult(
                        RegimeNames.TryParse(columns.Regime[row], out var regime) ? regime : Regime.Unresolved,
                        period,
                        [columns.Lyapunov[0][row]],
                        [columns.LyapunovError[0][row]],
                        double.NaN,
                        final,
                        cycle,
                        null,
                        null,
                        [],
                        Box: states.Count > 0 ? StateBox.Of(states) : null);
                    byPoint[columns.Point[row]] = catalog.Label(AttractorSignature.Of(result, spec.Analysis.Tolerance));
                }
            }
        }
    }

    private static async Task<double[][]> Columns(
        ParquetRowGroupReader group, Func<string, DataField> field, string prefix, IReadOnlyList<string> variables, int rows, CancellationToken token)
    {
        var columns = new double[variables.Count][];
        for (var i = 0; i < variables.Count; i++)
        {
            columns[i] = await RunTable.Read<double>(group, field(prefix + variables[i]), rows, token);
        }

        return columns;
    }

    private static double[] Row(double[][] columns, int row) => columns.Select(c => c[row]).ToArray();
}
