using System.Linq.Expressions;
using System.Runtime.Intrinsics;
using Sweeps.Core.Kernels;
using Sweeps.Core.Models;
using static Sweeps.Core.Integrators.DormandPrinceStepper;
using LinqExpression = System.Linq.Expressions.Expression;

namespace Sweeps.Core.Integrators;

/// <summary>
/// The six new stages of one Dormand–Prince trial step from (t, y) with step h and first slope k1: writes the
/// slopes k2 … k7 and the fifth-order solution <paramref name="next"/> (k7 is the slope there), and returns the
/// step's error norm max_i |err_i| / (atol + rtol·max(|y_i|, |next_i|)) — NaN when a value is not finite.
/// </summary>
internal delegate double DormandPrinceStages(
    double[] y, double[] p, double t, double h, double[] k1, double[] k2, double[] k3, double[] k4, double[] k5, double[] k6, double[] k7, double[] next, double atol, double rtol);

/// <summary>
/// <see cref="DormandPrinceStages"/> for four points side by side, each with its own time and step: entry i of each
/// array holds component i of the four points' values; returns the four error norms. Every lane computes what the
/// scalar delegate computes for its point, bit for bit (a NaN norm included).
/// </summary>
internal delegate Vector256<double> DormandPrinceLaneStages(
    Vector256<double>[] y,
    Vector256<double>[] p,
    Vector256<double> t,
    Vector256<double> h,
    Vector256<double>[] k1,
    Vector256<double>[] k2,
    Vector256<double>[] k3,
    Vector256<double>[] k4,
    Vector256<double>[] k5,
    Vector256<double>[] k6,
    Vector256<double>[] k7,
    Vector256<double>[] next,
    double atol,
    double rtol);

/// <summary>
/// Generates <see cref="DormandPrinceStages"/> for a model: the stage loops of <see cref="DormandPrinceStepper"/>
/// as straight-line code with the fused augmented right-hand side inlined, the stage states in locals — the same
/// operations in the same order (stage = y + h·((a₁k₁ + a₂k₂) + …), the first one y + (h·a₂₁)·k₁), so the
/// generated step gives the loops' bits. Compiled once per model and tangent-vector count.
/// </summary>
internal static class DormandPrinceKernel
{
    public static DormandPrinceStages Stages(Model model, int vectors) =>
        (DormandPrinceStages)FlowKernels.Cached(model, "dopri5", vectors, () => Build<DormandPrinceStages>(model, vectors, lanes: false));

    /// <summary>The stages of four points at once, each lane as <see cref="Stages"/> computes it.</summary>
    public static DormandPrinceLaneStages Lanes(Model model, int vectors) =>
        (DormandPrinceLaneStages)FlowKernels.Cached(model, "dopri5 lanes", vectors, () => Build<DormandPrinceLaneStages>(model, vectors, lanes: true));

    private static TDelegate Build<TDelegate>(Model model, int vectors, bool lanes)
    {
        var value = lanes ? typeof(Vector256<double>) : typeof(double);
        var arrays = new[] { "y", "p", "k1", "k2", "k3", "k4", "k5", "k6", "k7", "next" }
            .ToDictionary(name => name, name => LinqExpression.Parameter(value.MakeArrayType(), name));
        var (t, h) = (LinqExpression.Parameter(value, "t"), LinqExpression.Parameter(value, "h"));
        var body = new List<LinqExpression>();
        var code = new VariationalCode(model, vectors, lanes, arrays["p"], body);
        var size = code.Dimension;
        LinqExpression Element(string array, int i) => LinqExpression.ArrayAccess(arrays[array], LinqExpression.Constant(i));
        ParameterExpression[] Load(string array)
        {
            var locals = Enumerable.Range(0, size).Select(_ => code.Local()).ToArray();
            for (var i = 0; i < size; i++)
            {
                body.Add(LinqExpression.Assign(locals[i], Element(array, i)));
            }

            return locals;
        }

        var y = Load("y");
        var k = new List<ParameterExpression[]> { Load("k1") };
        var stage = Enumerable.Range(0, size).Select(_ => code.Local()).ToArray();
        var fifth = stage;

        // Stage s is evaluated at t + c_s·h on y + h·Σ a_sj k_j; rows as in the stepper, zero coefficients left out.
        (double C, double[] A)[] rows =
        [
            (C2, [A21]),
            (C3, [A31, A32]),
            (C4, [A41, A42, A43]),
            (C5, [A51, A52, A53, A54]),
            (1, [A61, A62, A63, A64, A65]),
            (1, [A71, 0, A73, A74, A75, A76]),
        ];
        var end = LinqExpression.Add(t, h);
        foreach (var (c, a) in rows)
        {
            var last = k.Count == 6;
            var target = last ? Enumerable.Range(0, size).Select(_ => code.Local()).ToArray() : stage;
            for (var i = 0; i < size; i++)
            {
                var increment = a.Length == 1
                    ? LinqExpression.Multiply(LinqExpression.Multiply(h, code.Constant(a[0])), k[0][i])
                    : LinqExpression.Multiply(h, Sum(code, a, k, i));
                body.Add(LinqExpression.Assign(target[i], LinqExpression.Add(y[i], increment)));
            }

            // The stepper evaluates the last two stages at t + h itself, the others at t + c·h. The last two share one
            // time expression, so functions of the time alone (a forcing term) are evaluated once for both.
            var time = c == 1 ? end : LinqExpression.Add(t, LinqExpression.Multiply(code.Constant(c), h));
            var slope = Enumerable.Range(0, size).Select(_ => code.Local()).ToArray();
            code.Emit(i => target[i], time, (i, value) => LinqExpression.Assign(slope[i], value));
            k.Add(slope);
            if (last)
            {
                fifth = target;
                for (var i = 0; i < size; i++)
                {
                    body.Add(LinqExpression.Assign(Element("next", i), target[i]));
                }
            }
        }

        for (var s = 1; s < k.Count; s++)
        {
            for (var i = 0; i < size; i++)
            {
                body.Add(LinqExpression.Assign(Element($"k{s + 1}", i), k[s][i]));
            }
        }

        // The error norm from the stages still in locals, as the stepper's loop computes it: Math.Max carries a NaN
        // through to the result, where the loop returns it at once — the same NaN either way. Lanes take Math.Max's
        // lane-wise form (LaneMath.Maximum), so a NaN anywhere in a lane's sums makes that lane's norm NaN too.
        var (atol, rtol) = (LinqExpression.Parameter(typeof(double), "atol"), LinqExpression.Parameter(typeof(double), "rtol"));
        var abs = lanes ? VectorMethods.Narrow.Abs : typeof(Math).GetMethod(nameof(Math.Abs), [typeof(double)])!;
        var max = lanes ? typeof(LaneMath).GetMethod(nameof(LaneMath.Maximum))! : typeof(Math).GetMethod(nameof(Math.Max), [typeof(double), typeof(double)])!;
        var (absolute, relative) = (code.Local(), code.Local());
        body.Add(LinqExpression.Assign(absolute, code.Broadcast(atol)));
        body.Add(LinqExpression.Assign(relative, code.Broadcast(rtol)));
        var worst = code.Local();
        body.Add(LinqExpression.Assign(worst, code.Constant(0.0)));
        double[] weights = [E1, 0, E3, E4, E5, E6, E7];
        for (var i = 0; i < size; i++)
        {
            var estimate = LinqExpression.Multiply(h, Sum(code, weights, k, i));
            var scale = LinqExpression.Add(absolute, LinqExpression.Multiply(relative, LinqExpression.Call(max, LinqExpression.Call(abs, y[i]), LinqExpression.Call(abs, fifth[i]))));
            var ratio = LinqExpression.Divide(LinqExpression.Call(abs, estimate), scale);
            body.Add(LinqExpression.Assign(worst, LinqExpression.Call(max, worst, ratio)));
        }

        body.Add(worst);
        var parameters = new[] { arrays["y"], arrays["p"], t, h, arrays["k1"], arrays["k2"], arrays["k3"], arrays["k4"], arrays["k5"], arrays["k6"], arrays["k7"], arrays["next"], atol, rtol };
        return LinqExpression.Lambda<TDelegate>(LinqExpression.Block(code.Variables, body), parameters).Compile();
    }

    /// <summary>((a₁·k₁ + a₂·k₂) + a₃·k₃) + …, left to right, skipping zero coefficients.</summary>
    private static LinqExpression Sum(VariationalCode code, double[] a, List<ParameterExpression[]> k, int i)
    {
        LinqExpression? sum = null;
        for (var j = 0; j < a.Length; j++)
        {
            if (a[j] != 0)
            {
                var term = LinqExpression.Multiply(code.Constant(a[j]), k[j][i]);
                sum = sum is null ? term : LinqExpression.Add(sum, term);
            }
        }

        return sum!;
    }
}
