using System.Linq.Expressions;
using System.Runtime.Intrinsics;
using Sweeps.Core.Integrators;
using Sweeps.Core.Models;
using LinqExpression = System.Linq.Expressions.Expression;

namespace Sweeps.Core.Kernels;

/// <summary>
/// One measured step of a map with tangent vectors: from the state <c>x</c> and parameters <c>p</c>, the
/// Jacobian entries (into <c>jacobian</c>, row-major, when asked for), the images J·q_c of the tangent vectors
/// <c>q</c> (into <c>jq</c>, column by column) and the next state f(x) (into <c>y</c>).
/// </summary>
internal delegate void MapStep<T>(T[] x, T[] p, T[] q, T[] jq, T[] jacobian, T[] y);

/// <summary>
/// Run-time generated map steps for maps of several variables: one straight-line delegate instead of f, Df and
/// a matrix product, each Jacobian entry computed once and identically zero entries left out of the products.
/// The scalar analyzer and the four-lane analyzer (<see cref="MapLaneAnalyzer"/>) call the same code — one
/// over doubles, one over <see cref="Vector256{T}"/> lanes, from the same <see cref="Expressions.NodeEmitter"/> on the same
/// expression trees — so every lane computes exactly what the scalar path computes.
/// </summary>
internal static class MapStepCode
{
    /// <summary>The step over doubles (one point); cached per model and vector count.</summary>
    public static MapStep<double> Scalar(Model model, int vectors) =>
        (MapStep<double>)FlowKernels.Cached(model, "map step", vectors, () => Build<double>(model, vectors));

    /// <summary>The step over four points side by side; lane j of entry i is component i of point j.</summary>
    public static MapStep<Vector256<double>> Lanes(Model model, int vectors) =>
        (MapStep<Vector256<double>>)FlowKernels.Cached(model, "map step lanes", vectors, () => Build<Vector256<double>>(model, vectors));

    private static MapStep<T> Build<T>(Model model, int vectors)
    {
        if (model.Kind != ModelKind.Map)
        {
            throw new ArgumentException("a map step needs a map", nameof(model));
        }

        var (x, p, q, jq, jacobian, y) = (Array("x"), Array("p"), Array("q"), Array("jq"), Array("jacobian"), Array("y"));
        var body = new List<LinqExpression>();

        // The flows' variational code does the same arithmetic: f, and J·q_c summed over the columns in order with
        // identically zero entries left out. A map has no time, so the time given is never read.
        var code = new VariationalCode(model, vectors, lanes: typeof(T) != typeof(double), p, body);
        var n = model.Dimension;
        var state = Enumerable.Range(0, n).Select(_ => code.Local()).ToArray();
        for (var i = 0; i < n; i++)
        {
            body.Add(LinqExpression.Assign(state[i], FlowKernels.Element(x, i)));
        }

        code.Emit(
            i => i < n ? state[i] : FlowKernels.Element(q, i - n),
            LinqExpression.Constant(0.0),
            (i, value) => LinqExpression.Assign(i < n ? FlowKernels.Element(y, i) : FlowKernels.Element(jq, i - n), value),
            (entry, value) => LinqExpression.Assign(FlowKernels.Element(jacobian, entry), value));
        body.Add(LinqExpression.Empty());
        return LinqExpression.Lambda<MapStep<T>>(LinqExpression.Block(code.Variables, body), x, p, q, jq, jacobian, y).Compile();

        ParameterExpression Array(string name) => LinqExpression.Parameter(typeof(T[]), name);
    }
}
