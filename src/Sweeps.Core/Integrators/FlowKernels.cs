using System.Collections.Concurrent;
using System.Linq.Expressions;
using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using Sweeps.Core.Expressions;
using Sweeps.Core.Models;
using LinqExpression = System.Linq.Expressions.Expression;

namespace Sweeps.Core.Integrators;

/// <summary>
/// One whole fixed step of the augmented system: advances <paramref name="y"/> (state and tangent vectors)
/// from <paramref name="t"/> by <paramref name="h"/> in place; <paramref name="slope"/> receives f(t, y) at the start.
/// </summary>
internal delegate void FixedStep(double[] y, double[] p, double t, double h, double[] slope);

/// <summary>
/// <see cref="FixedStep"/> for four points side by side: entry i of each array holds component i of the four
/// points' augmented states (or parameters, or slopes); the step and the time are the same for all four.
/// </summary>
internal delegate void LaneStep(Vector256<double>[] y, Vector256<double>[] p, double t, double h, Vector256<double>[] slope);

/// <summary>
/// The fused augmented derivative of four points side by side, each at its own time: entry i of each array holds
/// component i of the four points' values.
/// </summary>
internal delegate void LaneField(Vector256<double>[] y, Vector256<double>[] p, Vector256<double> t, Vector256<double>[] dy);

/// <summary>
/// Run-time generated code for flows, compiled once per model (and tangent-vector count): the fused
/// augmented right-hand side (one call instead of f, Df and a matrix product per evaluation), and the
/// whole Euler or RK4 step as straight-line code whose stage values live in locals, not arrays. The
/// operations and their order are those of the reference loops (<see cref="OdeSystem"/>,
/// <see cref="Rk4Stepper"/>), so the generated step reproduces them; one delegate call per step instead of
/// eight, and no bounds checks or copies between stages — the point of it is speed on the flows that
/// dominate a sweep's time.
/// </summary>
internal static class FlowKernels
{
    private static readonly ConditionalWeakTable<Model, ConcurrentDictionary<(string Kind, int Vectors), Lazy<Delegate>>> Compiled = new();

    /// <summary>The fused augmented derivative: dy = (f, Df·q_1, …, Df·q_k) at (t, y).</summary>
    public static VectorField Derivative(Model model, int vectors) =>
        (VectorField)Cached(model, "derivative", vectors, () => BuildDerivative<VectorField>(model, vectors, lanes: false));

    /// <summary>The fused augmented derivative of four points at once, each lane as <see cref="Derivative"/> computes it.</summary>
    public static LaneField LaneDerivative(Model model, int vectors) =>
        (LaneField)Cached(model, "derivative lanes", vectors, () => BuildDerivative<LaneField>(model, vectors, lanes: true));

    /// <summary>The whole step of <paramref name="method"/> (Euler or RK4).</summary>
    public static FixedStep Step(Model model, int vectors, IntegratorMethod method) =>
        (FixedStep)Cached(model, method.ToString(), vectors, () => BuildStep<FixedStep>(model, vectors, method, lanes: false));

    /// <summary>The whole step of <paramref name="method"/> for four points at once, each lane as <see cref="Step"/> computes it.</summary>
    public static LaneStep Lanes(Model model, int vectors, IntegratorMethod method) =>
        (LaneStep)Cached(model, method + " lanes", vectors, () => BuildStep<LaneStep>(model, vectors, method, lanes: true));

    internal static Delegate Cached(Model model, string kind, int vectors, Func<Delegate> build) =>
        Compiled.GetValue(model, _ => new()).GetOrAdd((kind, vectors), _ => new Lazy<Delegate>(build)).Value;

    private static TDelegate BuildDerivative<TDelegate>(Model model, int vectors, bool lanes)
    {
        var number = lanes ? typeof(Vector256<double>) : typeof(double);
        var (y, p, dy) = (LinqExpression.Parameter(number.MakeArrayType(), "y"), LinqExpression.Parameter(number.MakeArrayType(), "p"), LinqExpression.Parameter(number.MakeArrayType(), "dy"));
        var t = LinqExpression.Parameter(number, "t");
        var body = new List<LinqExpression>();
        var code = new VariationalCode(model, vectors, lanes, p, body);
        code.Emit(i => Element(y, i), t, (i, value) => LinqExpression.Assign(Element(dy, i), value));
        body.Add(LinqExpression.Empty());
        return LinqExpression.Lambda<TDelegate>(LinqExpression.Block(code.Variables, body), y, p, t, dy).Compile();
    }

    private static TDelegate BuildStep<TDelegate>(Model model, int vectors, IntegratorMethod method, bool lanes)
    {
        var array = lanes ? typeof(Vector256<double>[]) : typeof(double[]);
        var (y, p, slope) = (LinqExpression.Parameter(array, "y"), LinqExpression.Parameter(array, "p"), LinqExpression.Parameter(array, "slope"));
        var (t, h) = (LinqExpression.Parameter(typeof(double), "t"), LinqExpression.Parameter(typeof(double), "h"));
        var body = new List<LinqExpression>();
        var code = new VariationalCode(model, vectors, lanes, p, body);
        var step = code.Local();
        body.Add(LinqExpression.Assign(step, code.Broadcast(h)));
        var size = code.Dimension;
        var start = Locals(code, size);
        for (var i = 0; i < size; i++)
        {
            body.Add(LinqExpression.Assign(start[i], Element(y, i)));
        }

        // k1 = f(t, y), also the slope at the start of the step (dense output).
        var k1 = Locals(code, size);
        code.Emit(i => start[i], t, (i, value) => Both(LinqExpression.Assign(k1[i], value), LinqExpression.Assign(Element(slope, i), k1[i])));
        if (method == IntegratorMethod.Euler)
        {
            // y[i] += h * slope[i] (EulerStepper).
            for (var i = 0; i < size; i++)
            {
                body.Add(LinqExpression.Assign(Element(y, i), LinqExpression.Add(start[i], LinqExpression.Multiply(step, k1[i]))));
            }
        }
        else if (method == IntegratorMethod.Rk4)
        {
            // The stages of Rk4Stepper, operation for operation: stage = y + (0.5·h)·k, then y += (h/6)·(((k1 + 2·k2) + 2·k3) + k4).
            // The scalar products 0.5·h and h/6 are broadcast to the lanes, so every lane multiplies by the same bits.
            var halfStep = LinqExpression.Variable(typeof(double), "halfStep");
            var middle = LinqExpression.Variable(typeof(double), "middle");
            body.Add(LinqExpression.Assign(halfStep, LinqExpression.Multiply(LinqExpression.Constant(0.5), h)));
            body.Add(LinqExpression.Assign(middle, LinqExpression.Add(t, halfStep)));
            var half = code.Local();
            body.Add(LinqExpression.Assign(half, code.Broadcast(halfStep)));
            var stage = Locals(code, size);
            var k2 = Locals(code, size);
            var k3 = Locals(code, size);
            var k4 = Locals(code, size);
            Stage(body, stage, start, half, k1);
            code.Emit(i => stage[i], middle, (i, value) => LinqExpression.Assign(k2[i], value));
            Stage(body, stage, start, half, k2);
            code.Emit(i => stage[i], middle, (i, value) => LinqExpression.Assign(k3[i], value));
            Stage(body, stage, start, step, k3);
            code.Emit(i => stage[i], LinqExpression.Add(t, h), (i, value) => LinqExpression.Assign(k4[i], value));
            var sixth = code.Local();
            body.Add(LinqExpression.Assign(sixth, code.Broadcast(LinqExpression.Divide(h, LinqExpression.Constant(6.0)))));
            var two = code.Constant(2.0);
            code.Variables.AddRange([halfStep, middle]);
            for (var i = 0; i < size; i++)
            {
                var sum = LinqExpression.Add(LinqExpression.Add(LinqExpression.Add(k1[i], LinqExpression.Multiply(two, k2[i])), LinqExpression.Multiply(two, k3[i])), k4[i]);
                body.Add(LinqExpression.Assign(Element(y, i), LinqExpression.Add(start[i], LinqExpression.Multiply(sixth, sum))));
            }
        }
        else
        {
            throw new ArgumentException($"no generated step for {method}", nameof(method));
        }

        body.Add(LinqExpression.Empty());
        return LinqExpression.Lambda<TDelegate>(LinqExpression.Block(code.Variables, body), y, p, t, h, slope).Compile();
    }

    private static void Stage(List<LinqExpression> body, ParameterExpression[] stage, ParameterExpression[] start, LinqExpression factor, ParameterExpression[] k)
    {
        for (var i = 0; i < stage.Length; i++)
        {
            body.Add(LinqExpression.Assign(stage[i], LinqExpression.Add(start[i], LinqExpression.Multiply(factor, k[i]))));
        }
    }

    private static LinqExpression Both(LinqExpression first, LinqExpression second) => LinqExpression.Block(first, second);

    private static ParameterExpression[] Locals(VariationalCode code, int count) =>
        Enumerable.Range(0, count).Select(_ => code.Local()).ToArray();

    /// <summary>Entry <paramref name="index"/> of an array parameter, as an assignable expression (shared by the generated steps).</summary>
    internal static LinqExpression Element(ParameterExpression array, int index) => LinqExpression.ArrayAccess(array, LinqExpression.Constant(index));
}
