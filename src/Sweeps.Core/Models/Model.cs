using Sweeps.Core.Expressions;

namespace Sweeps.Core.Models;

/// <summary>
/// A parsed, differentiated and compiled model. Its right-hand side and its exact Jacobian are
/// compiled once; the delegates are thread-safe and allocate nothing.
/// </summary>
public sealed class Model
{
    internal Model(ModelSource source, Node[] equations, Node[] jacobian)
    {
        Source = source;
        Equations = equations;
        Jacobian = jacobian;
        UsesTime = equations.Any(e => ExpressionQueries.Mentions(e, SymbolKind.Time));
        Evaluate = ExpressionCompiler.Compile(equations);
        EvaluateJacobian = ExpressionCompiler.Compile(jacobian);
    }

    public ModelSource Source { get; }

    public ModelKind Kind => Source.Kind;

    public int Dimension => Source.Variables.Count;

    public IReadOnlyList<string> Variables => Source.Variables;

    public IReadOnlyList<string> Parameters => Source.Parameters;

    /// <summary>Parsed right-hand sides, one per variable.</summary>
    public IReadOnlyList<Node> Equations { get; }

    /// <summary>Symbolic Jacobian, row-major: entry [i*n + j] is ∂f_i/∂x_j.</summary>
    public IReadOnlyList<Node> Jacobian { get; }

    /// <summary>Whether any equation uses the time t (a forced flow).</summary>
    public bool UsesTime { get; }

    /// <summary>f(x, p, t) into a buffer of length n.</summary>
    public VectorField Evaluate { get; }

    /// <summary>Df(x, p, t) into a row-major buffer of length n².</summary>
    public VectorField EvaluateJacobian { get; }

    /// <summary>Parses, differentiates and compiles a model; on failure returns every problem found.</summary>
    public static bool TryBuild(ModelSource source, out Model? model, out IReadOnlyList<ModelError> errors)
    {
        var problems = new List<ModelError>();
        var scope = new Scope(source.Variables, source.Parameters, allowTime: source.Kind == ModelKind.Flow);
        var equations = new Node[source.Variables.Count];
        for (var i = 0; i < equations.Length; i++)
        {
            try
            {
                equations[i] = Parser.Parse(source.Equations[i], scope);
            }
            catch (ExpressionException error)
            {
                problems.Add(new ModelError(source.Variables[i], error.Column, error.Problem));
            }
        }

        errors = problems;
        if (problems.Count > 0)
        {
            model = null;
            return false;
        }

        var n = equations.Length;
        var jacobian = new Node[n * n];
        for (var i = 0; i < n; i++)
        {
            for (var j = 0; j < n; j++)
            {
                jacobian[(i * n) + j] = Derivative.Of(equations[i], new SymbolNode(SymbolKind.Variable, j, source.Variables[j]));
            }
        }

        model = new Model(source, equations, jacobian);
        return true;
    }
}
