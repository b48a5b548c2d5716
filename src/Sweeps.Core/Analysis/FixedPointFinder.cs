using MathNet.Numerics.LinearAlgebra;
using Sweeps.Core.Models;

namespace Sweeps.Core.Analysis;

/// <summary>
/// Locates fixed points (maps: f(x) = x) or equilibria (flows: f(x) = 0) by Newton's method with the
/// exact Jacobian from several starts, keeps those whose residual is tiny, and removes duplicates.
/// Not a hot path: it runs once per probe, so it uses MathNet.Numerics' dense solvers freely.
/// </summary>
public sealed class FixedPointFinder(Model model)
{
    private const int MaxIterations = 100;
    private const double ResidualTolerance = 1e-11;
    private const double SameTolerance = 1e-7;

    /// <summary>Fixed points reached from the given starts, sorted by their coordinates.</summary>
    public IReadOnlyList<FixedPoint> Find(IEnumerable<double[]> starts, double[] parameters)
    {
        var found = new List<FixedPoint>();
        foreach (var start in starts)
        {
            if (Newton(start, parameters) is not { } root || found.Any(f => Same(f.State, root)))
            {
                continue;
            }

            var jacobian = new double[model.Dimension * model.Dimension];
            model.EvaluateJacobian(root, parameters, 0, jacobian);
            var eigenvalues = SmallMatrix.Eigenvalues(jacobian, model.Dimension);
            found.Add(new FixedPoint(root, eigenvalues, FixedPointClassifier.Classify(eigenvalues, model.Kind)));
        }

        found.Sort((a, b) => Compare(a.State, b.State));
        return found;
    }

    /// <summary>
    /// Deterministic starts: the given states plus a lattice over their bounding box widened by half
    /// its size (at least ±1), 5 points per axis for up to 3 variables, a fixed pseudo-random cloud beyond.
    /// </summary>
    public static List<double[]> Starts(IReadOnlyList<double[]> seeds, int dimension)
    {
        var starts = seeds.Where(s => Array.TrueForAll(s, double.IsFinite)).Select(s => s.ToArray()).ToList();
        var low = new double[dimension];
        var high = new double[dimension];
        for (var j = 0; j < dimension; j++)
        {
            var values = starts.Select(s => s[j]).DefaultIfEmpty(0).ToArray();
            var (min, max) = (values.Min(), values.Max());
            var margin = Math.Max(1, (max - min) / 2);
            (low[j], high[j]) = (min - margin, max + margin);
        }

        if (dimension <= 3)
        {
            var total = (int)Math.Pow(5, dimension);
            for (var index = 0; index < total; index++)
            {
                var point = new double[dimension];
                var rest = index;
                for (var j = 0; j < dimension; j++)
                {
                    point[j] = low[j] + ((high[j] - low[j]) * (rest % 5) / 4.0);
                    rest /= 5;
                }

                starts.Add(point);
            }
        }
        else
        {
            var random = new Random(20261202);
            for (var index = 0; index < 64; index++)
            {
                starts.Add(Enumerable.Range(0, dimension).Select(j => low[j] + ((high[j] - low[j]) * random.NextDouble())).ToArray());
            }
        }

        return starts;
    }

    private double[]? Newton(double[] start, double[] parameters)
    {
        var n = model.Dimension;
        var x = start.ToArray();
        var f = new double[n];
        var jacobian = new double[n * n];
        var polished = false;
        for (var iteration = 0; iteration < MaxIterations; iteration++)
        {
            Residual(x, parameters, f);
            var scale = 1 + x.Max(Math.Abs);
            if (!Array.TrueForAll(f, double.IsFinite))
            {
                return null;
            }

            var converged = f.Max(Math.Abs) <= ResidualTolerance * scale;
            if (converged && polished)
            {
                return x;
            }

            // One Newton step past the tolerance: convergence is quadratic, so it brings the root to
            // full precision at the cost of a single solve.
            polished = converged;
            model.EvaluateJacobian(x, parameters, 0, jacobian);
            var matrix = Matrix<double>.Build.Dense(n, n, (i, j) => jacobian[(i * n) + j] - (model.Kind == ModelKind.Map && i == j ? 1 : 0));
            var step = matrix.Solve(Vector<double>.Build.Dense(f));
            if (!step.ForAll(double.IsFinite))
            {
                return null;
            }

            for (var i = 0; i < n; i++)
            {
                x[i] -= step[i];
            }
        }

        return null;
    }

    private void Residual(double[] x, double[] parameters, double[] f)
    {
        model.Evaluate(x, parameters, 0, f);
        if (model.Kind == ModelKind.Map)
        {
            for (var i = 0; i < f.Length; i++)
            {
                f[i] -= x[i];
            }
        }
    }

    private static bool Same(double[] a, double[] b)
    {
        for (var i = 0; i < a.Length; i++)
        {
            if (Math.Abs(a[i] - b[i]) > SameTolerance * (1 + Math.Abs(a[i])))
            {
                return false;
            }
        }

        return true;
    }

    private static int Compare(double[] a, double[] b)
    {
        for (var i = 0; i < a.Length; i++)
        {
            var c = a[i].CompareTo(b[i]);
            if (c != 0)
            {
                return c;
            }
        }

        return 0;
    }
}
