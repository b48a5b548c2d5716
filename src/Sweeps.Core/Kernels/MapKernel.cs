using System.Linq.Expressions;
using System.Reflection;
using System.Runtime.Intrinsics;
using Sweeps.Core.Expressions;
using Sweeps.Core.Models;
using LinqExpression = System.Linq.Expressions.Expression;

namespace Sweeps.Core.Kernels;

/// <summary>
/// Advances <see cref="MapKernel.Lanes"/> orbits of a one-variable map by a number of steps: x, the
/// parameters (per parameter, one vector per group), the running product of |f'| and the "needs the careful
/// path" mask, each as <see cref="MapKernel.Groups"/> vectors of four lanes.
/// </summary>
internal delegate void BlockSteps(Vector256<double>[] x, Vector256<double>[] parameters, Vector256<double>[] product, Vector256<double>[] flagged, int steps);

/// <summary>As <see cref="BlockSteps"/>, and after each step the 32 states are stored at window[(slot + step) · 32 …] (slot-major).</summary>
internal delegate void RecordingSteps(Vector256<double>[] x, Vector256<double>[] parameters, Vector256<double>[] product, Vector256<double>[] flagged, int steps, double[] window, int slot);

/// <summary>
/// Run-time generated loops for one-variable maps (System.Linq.Expressions → JIT, full optimisation at once):
/// the whole step loop for 32 orbits side by side, eight independent Vector256 chains, so the vector units and
/// the instruction-level parallelism of the core are used — one delegate call advances 32 points by many
/// steps. The code comes from the same <see cref="NodeEmitter"/> as the scalar delegates, on the same
/// expression trees, so every operation is the scalar one in the same order; IEEE arithmetic is lane-wise, and functions without an exact vector
/// form are called lane by lane, so each lane's orbit equals the scalar orbit bit for bit. A lane whose orbit
/// escapes, turns non-finite or whose running product leaves the safe range is flagged; its point is then
/// analysed by the scalar path, which handles those cases (escape step, superstable −∞, early logarithms).
/// </summary>
internal sealed class MapKernel
{
    public const int Groups = 8;
    public const int Width = 4;
    public const int Lanes = Groups * Width;

    private static readonly MethodInfo Abs = Generic(nameof(Vector256.Abs), 1);
    private static readonly MethodInfo GreaterThan = Generic(nameof(Vector256.GreaterThan), 2);
    private static readonly MethodInfo LessThan = Generic(nameof(Vector256.LessThan), 2);
    private static readonly MethodInfo LessThanOrEqual = Generic(nameof(Vector256.LessThanOrEqual), 2);
    private static readonly MethodInfo BitwiseAnd = Generic(nameof(Vector256.BitwiseAnd), 2);
    private static readonly MethodInfo BitwiseOr = Generic(nameof(Vector256.BitwiseOr), 2);
    private static readonly MethodInfo OnesComplement = Generic(nameof(Vector256.OnesComplement), 1);
    private static readonly MethodInfo GetElement = Generic(nameof(Vector256.GetElement), 2);
    private static readonly MethodInfo Create = typeof(Vector256).GetMethod(nameof(Vector256.Create), [typeof(double), typeof(double), typeof(double), typeof(double)])!;
    private static readonly MethodInfo CopyTo = typeof(Vector256).GetMethods(BindingFlags.Public | BindingFlags.Static)
        .First(m => m.Name == nameof(Vector256.CopyTo) && m.IsGenericMethodDefinition && m.GetParameters().Length == 3 && m.GetParameters()[1].ParameterType.IsArray)
        .MakeGenericMethod(typeof(double));
    private static readonly MethodInfo Broadcast = typeof(Vector256).GetMethod(nameof(Vector256.Create), [typeof(double)])!;

    // Compiled kernels per model and escape bound: a process computes many chunks of one run, and compiling
    // four loops costs milliseconds. Delegates are thread-safe; the per-thread state lives in the caller.
    private static readonly System.Runtime.CompilerServices.ConditionalWeakTable<Model, System.Collections.Concurrent.ConcurrentDictionary<double, Lazy<MapKernel>>> Compiled = new();

    /// <summary>The kernels of <paramref name="model"/>, compiled once per model instance and escape bound.</summary>
    public static MapKernel For(Model model, double escape, double safeLow, double safeHigh) =>
        Compiled.GetValue(model, _ => new()).GetOrAdd(escape, e => new Lazy<MapKernel>(() => new MapKernel(model, e, safeLow, safeHigh))).Value;

    public MapKernel(Model model, double escape, double safeLow, double safeHigh)
    {
        if (model.Kind != ModelKind.Map || model.Dimension != 1)
        {
            throw new ArgumentException("the block kernel is for one-variable maps", nameof(model));
        }

        // Each loop is compiled when first asked for (a few milliseconds each): without exponents the measuring
        // loops are never needed, with them the plain recording loop is not.
        transient = new(() => Build<BlockSteps>(model, escape, safeLow, safeHigh, derivative: false, record: false));
        measure = new(() => Build<BlockSteps>(model, escape, safeLow, safeHigh, derivative: true, record: false));
        recordPlain = new(() => Build<RecordingSteps>(model, escape, safeLow, safeHigh, derivative: false, record: true));
        recordMeasure = new(() => Build<RecordingSteps>(model, escape, safeLow, safeHigh, derivative: true, record: true));
    }

    private readonly Lazy<BlockSteps> transient;
    private readonly Lazy<BlockSteps> measure;
    private readonly Lazy<RecordingSteps> recordPlain;
    private readonly Lazy<RecordingSteps> recordMeasure;

    /// <summary><see cref="Transient"/>, recording each state.</summary>
    public RecordingSteps RecordPlain => recordPlain.Value;

    /// <summary><see cref="Measure"/>, recording each state.</summary>
    public RecordingSteps RecordMeasure => recordMeasure.Value;

    /// <summary>x ← f(x), flagging lanes that leave ±escape.</summary>
    public BlockSteps Transient => transient.Value;

    /// <summary>product ← product·|f'(x)|, then x ← f(x); flags lanes whose product leaves the safe range or whose x escapes.</summary>
    public BlockSteps Measure => measure.Value;

    private static TDelegate Build<TDelegate>(Model model, double escape, double safeLow, double safeHigh, bool derivative, bool record)
    {
        var window = LinqExpression.Parameter(typeof(double[]), "window");
        var slot = LinqExpression.Parameter(typeof(int), "slot");
        var x = LinqExpression.Parameter(typeof(Vector256<double>[]), "x");
        var p = LinqExpression.Parameter(typeof(Vector256<double>[]), "parameters");
        var product = LinqExpression.Parameter(typeof(Vector256<double>[]), "product");
        var flagged = LinqExpression.Parameter(typeof(Vector256<double>[]), "flagged");
        var steps = LinqExpression.Parameter(typeof(int), "steps");
        var variables = new List<ParameterExpression>();
        var body = new List<LinqExpression>();
        var constants = new Dictionary<long, ParameterExpression>();

        // Vector constants live in block variables, created once before the loop.
        ParameterExpression Constant(double value)
        {
            var bits = BitConverter.DoubleToInt64Bits(value);
            if (!constants.TryGetValue(bits, out var variable))
            {
                variable = LinqExpression.Variable(typeof(Vector256<double>));
                variables.Add(variable);
                body.Add(LinqExpression.Assign(variable, LinqExpression.Call(Broadcast, LinqExpression.Constant(value))));
                constants[bits] = variable;
            }

            return variable;
        }

        var escapeVector = Constant(escape);
        var low = Constant(safeLow);
        var high = Constant(safeHigh);
        var state = new ParameterExpression[Groups];
        var running = new ParameterExpression[Groups];
        var flags = new ParameterExpression[Groups];
        var parameters = new ParameterExpression[model.Source.Parameters.Count, Groups];
        for (var g = 0; g < Groups; g++)
        {
            state[g] = Local(variables, body, LinqExpression.ArrayIndex(x, LinqExpression.Constant(g)));
            running[g] = Local(variables, body, LinqExpression.ArrayIndex(product, LinqExpression.Constant(g)));
            flags[g] = Local(variables, body, LinqExpression.ArrayIndex(flagged, LinqExpression.Constant(g)));
            for (var k = 0; k < parameters.GetLength(0); k++)
            {
                parameters[k, g] = Local(variables, body, LinqExpression.ArrayIndex(p, LinqExpression.Constant((k * Groups) + g)));
            }
        }

        var step = LinqExpression.Variable(typeof(int), "step");
        variables.Add(step);
        body.Add(LinqExpression.Assign(step, LinqExpression.Constant(0)));
        var loopBody = new List<LinqExpression>();
        var temporaries = new List<ParameterExpression>();
        for (var g = 0; g < Groups; g++)
        {
            var emitter = Emitter(state[g], Enumerable.Range(0, parameters.GetLength(0)).Select(k => parameters[k, g]).ToArray(), Constant);
            if (derivative)
            {
                var growth = LinqExpression.Call(Abs, emitter.Emit(model.Jacobian[0]));
                temporaries.AddRange(emitter.Temporaries);
                loopBody.Add(LinqExpression.Assign(running[g], LinqExpression.Multiply(running[g], growth)));
                var inside = LinqExpression.Call(BitwiseAnd, LinqExpression.Call(GreaterThan, running[g], low), LinqExpression.Call(LessThan, running[g], high));
                loopBody.Add(LinqExpression.Assign(flags[g], LinqExpression.Call(BitwiseOr, flags[g], LinqExpression.Call(OnesComplement, inside))));
            }
        }

        // All derivatives first (they read x before the step), then all the steps: the eight chains interleave.
        for (var g = 0; g < Groups; g++)
        {
            var emitter = Emitter(state[g], Enumerable.Range(0, parameters.GetLength(0)).Select(k => parameters[k, g]).ToArray(), Constant);
            loopBody.Add(LinqExpression.Assign(state[g], emitter.Emit(model.Equations[0])));
            temporaries.AddRange(emitter.Temporaries);
            var bounded = LinqExpression.Call(LessThanOrEqual, LinqExpression.Call(Abs, state[g]), escapeVector);
            loopBody.Add(LinqExpression.Assign(flags[g], LinqExpression.Call(BitwiseOr, flags[g], LinqExpression.Call(OnesComplement, bounded))));
        }

        if (record)
        {
            // window[(slot + step) · Lanes + g · Width …] = x_g
            var row = LinqExpression.Multiply(LinqExpression.Add(slot, step), LinqExpression.Constant(Lanes));
            for (var g = 0; g < Groups; g++)
            {
                loopBody.Add(LinqExpression.Call(CopyTo, state[g], window, LinqExpression.Add(row, LinqExpression.Constant(g * Width))));
            }
        }

        loopBody.Add(LinqExpression.PreIncrementAssign(step));
        var exit = LinqExpression.Label("done");
        body.Add(LinqExpression.Loop(
            LinqExpression.IfThenElse(
                LinqExpression.LessThan(step, steps),
                LinqExpression.Block(temporaries, loopBody),
                LinqExpression.Break(exit)),
            exit));
        for (var g = 0; g < Groups; g++)
        {
            body.Add(LinqExpression.Assign(LinqExpression.ArrayAccess(x, LinqExpression.Constant(g)), state[g]));
            body.Add(LinqExpression.Assign(LinqExpression.ArrayAccess(product, LinqExpression.Constant(g)), running[g]));
            body.Add(LinqExpression.Assign(LinqExpression.ArrayAccess(flagged, LinqExpression.Constant(g)), flags[g]));
        }

        var block = LinqExpression.Block(variables, body);
        return record
            ? LinqExpression.Lambda<TDelegate>(block, x, p, product, flagged, steps, window, slot).Compile()
            : LinqExpression.Lambda<TDelegate>(block, x, p, product, flagged, steps).Compile();
    }

    private static ParameterExpression Local(List<ParameterExpression> variables, List<LinqExpression> body, LinqExpression value)
    {
        var variable = LinqExpression.Variable(typeof(Vector256<double>));
        variables.Add(variable);
        body.Add(LinqExpression.Assign(variable, value));
        return variable;
    }

    private static MethodInfo Generic(string name, int arguments) =>
        typeof(Vector256).GetMethods(BindingFlags.Public | BindingFlags.Static)
            .First(m => m.Name == name && m.IsGenericMethodDefinition && m.GetParameters().Length == arguments)
            .MakeGenericMethod(typeof(double));

    /// <summary>The shared emitter over four lanes: the scalar operations, lane-wise; catalog functions lane by lane.</summary>
    private static NodeEmitter Emitter(ParameterExpression x, ParameterExpression[] p, Func<double, ParameterExpression> constant)
    {
        NodeEmitter? emitter = null;
        emitter = new NodeEmitter(
            typeof(Vector256<double>),
            value => constant(value),
            symbol => symbol.Kind switch
            {
                SymbolKind.Variable => x,
                SymbolKind.Parameter => p[symbol.Index],
                _ => throw new ArgumentException("a map has no time"),
            },
            (method, arguments) => PerLane(emitter!, method, arguments));
        return emitter;
    }

    /// <summary>
    /// A function on four lanes: its vector form where the catalog has one with the scalar bits in every lane
    /// (<see cref="FunctionCatalog.LaneMethod"/>), else the scalar method on each lane, reassembled.
    /// </summary>
    internal static LinqExpression PerLane(NodeEmitter emitter, MethodInfo method, IReadOnlyList<LinqExpression> arguments)
    {
        if (FunctionCatalog.LaneMethod(method) is { } vectorForm)
        {
            return LinqExpression.Call(vectorForm, arguments);
        }

        var values = arguments.Select(_ => emitter.Temporary()).ToArray();
        var steps = arguments.Select((a, i) => (LinqExpression)LinqExpression.Assign(values[i], a)).ToList();
        var lanes = Enumerable.Range(0, Width).Select(lane => (LinqExpression)LinqExpression.Call(
            method,
            values.Select(v => (LinqExpression)LinqExpression.Call(GetElement, v, LinqExpression.Constant(lane))))).ToArray();
        steps.Add(LinqExpression.Call(Create, lanes));
        return LinqExpression.Block(steps);
    }
}
