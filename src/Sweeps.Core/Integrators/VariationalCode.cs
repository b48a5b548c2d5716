using System.Linq.Expressions;
using Sweeps.Core.Expressions;
using Sweeps.Core.Models;
using LinqExpression = System.Linq.Expressions.Expression;

namespace Sweeps.Core.Integrators;

/// <summary>
/// Emits, as straight-line System.Linq.Expressions code, the right-hand side of a flow augmented with
/// k tangent vectors: f(x, t) and, for each vector q_c, Df(x, t)·q_c. Each Jacobian entry is computed
/// once per evaluation, entries that are identically zero are left out, and the products are summed in
/// column order — the order of <see cref="OdeSystem"/>'s reference loop, so the values agree with it
/// except for the sign of an exact zero. Used for the fused derivative delegate and inside the
/// generated Runge–Kutta step, where the stage values never leave registers and locals.
/// </summary>
internal sealed class VariationalCode
{
    private readonly Model model;
    private readonly int vectors;
    private readonly ParameterExpression[] parameters;

    /// <param name="model">The flow.</param>
    /// <param name="vectors">Tangent vectors k (0 for the state alone).</param>
    /// <param name="p">The parameter array; each parameter is read into a local once, up front.</param>
    /// <param name="body">Statements of the enclosing block; the parameter loads are appended.</param>
    public VariationalCode(Model model, int vectors, LinqExpression p, List<LinqExpression> body)
    {
        this.model = model;
        this.vectors = vectors;
        parameters = new ParameterExpression[model.Parameters.Count];
        for (var i = 0; i < parameters.Length; i++)
        {
            parameters[i] = LinqExpression.Variable(typeof(double), model.Parameters[i]);
            body.Add(LinqExpression.Assign(parameters[i], LinqExpression.ArrayIndex(p, LinqExpression.Constant(i))));
        }

        Variables.AddRange(parameters);
    }

    /// <summary>Block variables the emitted code needs (declare them in the enclosing block).</summary>
    public List<ParameterExpression> Variables { get; } = [];

    /// <summary>Length of the augmented vector: n·(1 + k).</summary>
    public int Dimension => model.Dimension * (1 + vectors);

    /// <summary>
    /// Appends to <paramref name="body"/> the statements that compute the augmented derivative at
    /// (<paramref name="time"/>, <paramref name="input"/>) and hand entry i to <paramref name="output"/>.
    /// <paramref name="input"/> must be cheap and side-effect free (a local or an array element): it is read
    /// once per use.
    /// </summary>
    public void Emit(Func<int, LinqExpression> input, LinqExpression time, Func<int, LinqExpression, LinqExpression> output, List<LinqExpression> body)
    {
        var n = model.Dimension;
        var emitter = new NodeEmitter(
            typeof(double),
            value => LinqExpression.Constant(value),
            symbol => symbol.Kind switch
            {
                SymbolKind.Variable => input(symbol.Index),
                SymbolKind.Parameter => parameters[symbol.Index],
                _ => time,
            },
            (method, arguments) => LinqExpression.Call(method, arguments));

        // All values first, then the outputs: an output may overwrite an input (in-place stages).
        var values = new List<(int Index, LinqExpression Value)>();
        for (var i = 0; i < n; i++)
        {
            values.Add((i, Local(emitter.Emit(model.Equations[i]), body)));
        }

        if (vectors > 0)
        {
            var jacobian = new ParameterExpression?[n * n];
            for (var entry = 0; entry < jacobian.Length; entry++)
            {
                if (model.Jacobian[entry] is not NumberNode { Value: 0 })
                {
                    jacobian[entry] = Local(emitter.Emit(model.Jacobian[entry]), body);
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

                    values.Add((offset + i, Local(sum ?? LinqExpression.Constant(0.0), body)));
                }
            }
        }

        Variables.AddRange(emitter.Temporaries);
        foreach (var (index, value) in values)
        {
            body.Add(output(index, value));
        }
    }

    /// <summary>A new double local of the block.</summary>
    public ParameterExpression Local()
    {
        var local = LinqExpression.Variable(typeof(double));
        Variables.Add(local);
        return local;
    }

    private ParameterExpression Local(LinqExpression value, List<LinqExpression> body)
    {
        var local = Local();
        body.Add(LinqExpression.Assign(local, value));
        return local;
    }
}
