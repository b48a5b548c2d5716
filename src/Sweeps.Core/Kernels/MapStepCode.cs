using System.Linq.Expressions;
using System.Runtime.Intrinsics;
using Sweeps.Core.Expressions;
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
/// over doubles, one over <see cref="Vector256{T}"/> lanes, from the same <see cref="NodeEmitter"/> on the same
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

        var lanes = typeof(T) != typeof(double);
        var array = typeof(T[]);
        var (x, p, q, jq, jacobian, y) = (Array("x"), Array("p"), Array("q"), Array("jq"), Array("jacobian"), Array("y"));
        var body = new List<LinqExpression>();
        var variables = new List<ParameterExpression>();
        var constants = new Dictionary<long, ParameterExpression>();
        ParameterExpression Local(LinqExpression value)
        {
            var local = LinqExpression.Variable(typeof(T));
            variables.Add(local);
            body.Add(LinqExpression.Assign(local, value));
            return local;
        }

        // Numbers: plain constants, or for lanes a broadcast made once up front (never a boxed vector constant).
        var broadcast = typeof(Vector256).GetMethod(nameof(Vector256.Create), [typeof(double)])!;
        var prologue = new List<LinqExpression>();
        LinqExpression Constant(double value)
        {
            if (!lanes)
            {
                return LinqExpression.Constant(value);
            }

            var bits = BitConverter.DoubleToInt64Bits(value);
            if (!constants.TryGetValue(bits, out var variable))
            {
                variable = LinqExpression.Variable(typeof(T));
                variables.Add(variable);
                prologue.Add(LinqExpression.Assign(variable, LinqExpression.Call(broadcast, LinqExpression.Constant(value))));
                constants[bits] = variable;
            }

            return variable;
        }

        var n = model.Dimension;
        var state = Enumerable.Range(0, n).Select(i => Local(Element(x, i))).ToArray();
        var parameters = Enumerable.Range(0, model.Parameters.Count).Select(k => Local(Element(p, k))).ToArray();
        NodeEmitter? emitter = null;
        emitter = new NodeEmitter(
            typeof(T),
            Constant,
            symbol => symbol.Kind switch
            {
                SymbolKind.Variable => state[symbol.Index],
                SymbolKind.Parameter => parameters[symbol.Index],
                _ => throw new ArgumentException("a map has no time"),
            },
            (method, arguments) => lanes ? MapKernel.PerLane(emitter!, method, arguments) : LinqExpression.Call(method, arguments));

        var entries = new ParameterExpression?[n * n];
        if (vectors > 0)
        {
            for (var entry = 0; entry < entries.Length; entry++)
            {
                if (model.Jacobian[entry] is not NumberNode { Value: 0 })
                {
                    entries[entry] = Local(emitter.Emit(model.Jacobian[entry]));
                }

                body.Add(LinqExpression.Assign(Element(jacobian, entry), entries[entry] ?? Constant(0.0)));
            }

            // J·q_c, summed over the columns in order; a row of zeros gives zero.
            for (var c = 0; c < vectors; c++)
            {
                for (var i = 0; i < n; i++)
                {
                    LinqExpression? sum = null;
                    for (var j = 0; j < n; j++)
                    {
                        if (entries[(i * n) + j] is { } value)
                        {
                            var term = LinqExpression.Multiply(value, Element(q, (c * n) + j));
                            sum = sum is null ? term : LinqExpression.Add(sum, term);
                        }
                    }

                    body.Add(LinqExpression.Assign(Element(jq, (c * n) + i), sum ?? Constant(0.0)));
                }
            }
        }

        var images = Enumerable.Range(0, n).Select(i => Local(emitter.Emit(model.Equations[i]))).ToArray();
        for (var i = 0; i < n; i++)
        {
            body.Add(LinqExpression.Assign(Element(y, i), images[i]));
        }

        variables.AddRange(emitter.Temporaries);
        body.InsertRange(0, prologue);
        body.Add(LinqExpression.Empty());
        return LinqExpression.Lambda<MapStep<T>>(LinqExpression.Block(variables, body), x, p, q, jq, jacobian, y).Compile();

        ParameterExpression Array(string name) => LinqExpression.Parameter(array, name);
    }

    private static LinqExpression Element(ParameterExpression array, int index) => LinqExpression.ArrayAccess(array, LinqExpression.Constant(index));
}
