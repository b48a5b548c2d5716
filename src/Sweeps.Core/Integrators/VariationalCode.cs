using System.Linq.Expressions;
using System.Runtime.Intrinsics;
using Sweeps.Core.Expressions;
using Sweeps.Core.Kernels;
using Sweeps.Core.Models;
using LinqExpression = System.Linq.Expressions.Expression;

namespace Sweeps.Core.Integrators;

/// <summary>
/// Emits, as straight-line System.Linq.Expressions code, the right-hand side of a flow augmented with
/// k tangent vectors: f(x, t) and, for each vector q_c, Df(x, t)·q_c. Each Jacobian entry is computed
/// once per evaluation, entries that are identically zero are left out, and the products are summed in
/// column order — the order of <see cref="OdeSystem"/>'s reference loop, so the values agree with it
/// except for the sign of an exact zero. Used for the fused derivative delegate and inside the
/// generated Runge–Kutta step, where the stage values never leave registers and locals. Over
/// <see cref="Vector256{T}"/> values (four points side by side) IEEE arithmetic is lane-wise and catalog
/// functions are called lane by lane, so every lane computes exactly what the scalar code computes.
/// </summary>
internal sealed class VariationalCode
{
    private readonly Model model;
    private readonly int vectors;
    private readonly ParameterExpression[] parameters;
    private readonly Dictionary<long, ParameterExpression> constants = [];

    // Function values that read no variable, kept from the first evaluation that needed them: those that read
    // parameters only, for every later one; those that read the time too, for later ones at the same time expression.
    private readonly Dictionary<(LinqExpression? Time, Node Node), ParameterExpression> stateFree = [];
    private readonly List<LinqExpression> body;

    /// <param name="model">The flow.</param>
    /// <param name="vectors">Tangent vectors k (0 for the state alone).</param>
    /// <param name="lanes">Values are <see cref="Vector256{T}"/> of four points instead of doubles.</param>
    /// <param name="p">The parameter array (of the value type); each parameter is read into a local once, up front.</param>
    /// <param name="body">Statements of the enclosing block; parameter loads and vector constants are appended as they are needed.</param>
    public VariationalCode(Model model, int vectors, bool lanes, LinqExpression p, List<LinqExpression> body)
    {
        this.model = model;
        this.vectors = vectors;
        this.body = body;
        Type = lanes ? typeof(Vector256<double>) : typeof(double);
        parameters = new ParameterExpression[model.Parameters.Count];
        for (var i = 0; i < parameters.Length; i++)
        {
            parameters[i] = Local();
            body.Add(LinqExpression.Assign(parameters[i], LinqExpression.ArrayIndex(p, LinqExpression.Constant(i))));
        }
    }

    /// <summary>The value type: double, or four lanes.</summary>
    public Type Type { get; }

    private bool Lanes => Type != typeof(double);

    /// <summary>A number as a value: a constant, or for lanes a broadcast made once into a block variable (never a boxed vector constant).</summary>
    public LinqExpression Constant(double value)
    {
        if (!Lanes)
        {
            return LinqExpression.Constant(value);
        }

        var bits = BitConverter.DoubleToInt64Bits(value);
        if (!constants.TryGetValue(bits, out var variable))
        {
            variable = Local();
            body.Insert(0, LinqExpression.Assign(variable, Broadcast(LinqExpression.Constant(value))));
            constants[bits] = variable;
        }

        return variable;
    }

    /// <summary>A scalar double expression as a value (broadcast to every lane).</summary>
    public LinqExpression Broadcast(LinqExpression scalar) =>
        Lanes ? LinqExpression.Call(VectorMethods.Narrow.Broadcast, scalar) : scalar;

    /// <summary>Block variables the emitted code needs (declare them in the enclosing block).</summary>
    public List<ParameterExpression> Variables { get; } = [];

    /// <summary>Length of the augmented vector: n·(1 + k).</summary>
    public int Dimension => model.Dimension * (1 + vectors);

    /// <summary>
    /// Appends to the block the statements that compute the augmented derivative at
    /// (<paramref name="time"/>, <paramref name="input"/>) and hand entry i to <paramref name="output"/> — for a map,
    /// the image f(x) and J·q_c. <paramref name="input"/> must be cheap and side-effect free (a local or an array
    /// element): it is read once per use. <paramref name="jacobianOutput"/>, when given, receives every Jacobian
    /// entry (row-major; identically zero ones as zero) with the tangent vectors. Function values that read no
    /// variable are computed once per block for the parameters, and once per <paramref name="time"/> expression (pass
    /// the same object for stages at the same time): the block is straight-line code, so the first evaluation always
    /// runs before the later ones read it.
    /// </summary>
    public void Emit(Func<int, LinqExpression> input, LinqExpression time, Func<int, LinqExpression, LinqExpression> output, Func<int, LinqExpression, LinqExpression>? jacobianOutput = null)
    {
        var n = model.Dimension;
        // Lanes read the time from a local: one broadcast of a shared time, or the lanes' own times (adaptive steps).
        var now = model.UsesTime && Lanes ? Local(time.Type == Type ? time : Broadcast(time)) : time;
        NodeEmitter? emitter = null;
        emitter = new NodeEmitter(
            Type,
            Constant,
            symbol => symbol.Kind switch
            {
                SymbolKind.Variable => input(symbol.Index),
                SymbolKind.Parameter => parameters[symbol.Index],
                _ => now,
            },
            (method, arguments) => Lanes ? MapKernel.PerLane(emitter!, method, arguments) : LinqExpression.Call(method, arguments),
            (node, emit) =>
            {
                var key = (ExpressionQueries.Mentions(node, SymbolKind.Time) ? time : null, node);
                if (stateFree.TryGetValue(key, out var known))
                {
                    return known;
                }

                var local = Local();
                stateFree[key] = local;
                return LinqExpression.Assign(local, emit());
            });

        // All values first, then the outputs: an output may overwrite an input (in-place stages).
        var values = new List<(int Index, LinqExpression Value)>();
        var entries = new List<LinqExpression>();
        for (var i = 0; i < n; i++)
        {
            values.Add((i, Local(emitter.Emit(model.Equations[i]))));
        }

        if (vectors > 0)
        {
            var jacobian = new ParameterExpression?[n * n];
            for (var entry = 0; entry < jacobian.Length; entry++)
            {
                if (model.Jacobian[entry] is not NumberNode { Value: 0 })
                {
                    jacobian[entry] = Local(emitter.Emit(model.Jacobian[entry]));
                }

                if (jacobianOutput is not null)
                {
                    entries.Add(jacobianOutput(entry, jacobian[entry] ?? Constant(0.0)));
                }
            }

            for (var c = 0; c < vectors; c++)
            {
                var offset = n * (c + 1);
                for (var i = 0; i < n; i++)
                {
                    LinqExpression? sum = null;
                    for (var j = 0; j < n; j++)
                    {
                        if (jacobian[(i * n) + j] is { } entry)
                        {
                            var term = LinqExpression.Multiply(entry, input(offset + j));
                            sum = sum is null ? term : LinqExpression.Add(sum, term);
                        }
                    }

                    values.Add((offset + i, Local(sum ?? Constant(0.0))));
                }
            }
        }

        Variables.AddRange(emitter.Temporaries);
        foreach (var (index, value) in values)
        {
            body.Add(output(index, value));
        }

        body.AddRange(entries);
    }

    /// <summary>A new local of the value type.</summary>
    public ParameterExpression Local()
    {
        var local = LinqExpression.Variable(Type);
        Variables.Add(local);
        return local;
    }

    private ParameterExpression Local(LinqExpression value)
    {
        var local = Local();
        body.Add(LinqExpression.Assign(local, value));
        return local;
    }
}
