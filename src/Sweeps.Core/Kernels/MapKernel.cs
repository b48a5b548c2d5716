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
/// the whole step loop for 32 orbits side by side — eight independent Vector256 chains, or four Vector512 chains where
/// the processor has 512-bit vectors (twice the lanes per instruction) — so the vector units and the instruction-level
/// parallelism of the core are used; one delegate call advances 32 points by many steps. The caller's state is eight
/// Vector256 per quantity either way (a wide loop joins them in pairs on entry and splits them on exit). The code
/// comes from the same <see cref="NodeEmitter"/> as the scalar delegates, on the same expression trees, so every
/// operation is the scalar one in the same order; IEEE arithmetic is lane-wise, and functions without an exact vector
/// form are called lane by lane, so each lane's orbit equals the scalar orbit bit for bit. A lane whose orbit
/// escapes, turns non-finite or whose running product leaves the safe range is flagged; its point is then
/// analysed by the scalar path, which handles those cases (escape step, superstable −∞, early logarithms).
/// </summary>
internal sealed class MapKernel
{
    public const int Groups = 8;
    public const int Width = 4;
    public const int Lanes = Groups * Width;

    /// <summary>
    /// Doubles per vector of the generated loops where the caller leaves it open: eight where the processor has
    /// 512-bit vectors (twice the lanes per instruction), else four. The lanes' arithmetic is the same either way.
    /// </summary>
    public static int PreferredWidth => Vector512.IsHardwareAccelerated ? 8 : 4;

    // Compiled kernels per model, escape bound and vector width: a process computes many chunks of one run, and
    // compiling four loops costs milliseconds. Delegates are thread-safe; the per-thread state lives in the caller.
    private static readonly System.Runtime.CompilerServices.ConditionalWeakTable<Model, System.Collections.Concurrent.ConcurrentDictionary<(double, int), Lazy<MapKernel>>> Compiled = new();

    /// <summary>The kernels of <paramref name="model"/>, compiled once per model instance, escape bound and vector width (4 or 8).</summary>
    public static MapKernel For(Model model, double escape, double safeLow, double safeHigh, int width) =>
        Compiled.GetValue(model, _ => new()).GetOrAdd((escape, width), key => new Lazy<MapKernel>(() => new MapKernel(model, key.Item1, safeLow, safeHigh, key.Item2))).Value;

    public MapKernel(Model model, double escape, double safeLow, double safeHigh, int width)
    {
        if (model.Kind != ModelKind.Map || model.Dimension != 1)
        {
            throw new ArgumentException("the block kernel is for one-variable maps", nameof(model));
        }

        var vector = width switch
        {
            Width => VectorMethods.Narrow,
            2 * Width => VectorMethods.Wide,
            _ => throw new ArgumentOutOfRangeException(nameof(width), width, "the block kernel's vectors hold 4 or 8 doubles"),
        };

        // Each loop is compiled when first asked for (a few milliseconds each): without exponents the measuring
        // loops are never needed, with them the plain recording loop is not.
        transient = new(() => Build<BlockSteps>(model, vector, escape, safeLow, safeHigh, derivative: false, record: false));
        measure = new(() => Build<BlockSteps>(model, vector, escape, safeLow, safeHigh, derivative: true, record: false));
        recordPlain = new(() => Build<RecordingSteps>(model, vector, escape, safeLow, safeHigh, derivative: false, record: true));
        recordMeasure = new(() => Build<RecordingSteps>(model, vector, escape, safeLow, safeHigh, derivative: true, record: true));
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

    private static TDelegate Build<TDelegate>(Model model, VectorMethods vector, double escape, double safeLow, double safeHigh, bool derivative, bool record)
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
                variable = LinqExpression.Variable(vector.Type);
                variables.Add(variable);
                body.Add(LinqExpression.Assign(variable, LinqExpression.Call(vector.Broadcast, LinqExpression.Constant(value))));
                constants[bits] = variable;
            }

            return variable;
        }

        // The caller's state is eight four-lane vectors per quantity; a wide loop joins them in pairs.
        var groups = Lanes / vector.Width;
        var span = vector.Width / Width;
        var escapeVector = Constant(escape);
        var low = Constant(safeLow);
        var high = Constant(safeHigh);
        var state = new ParameterExpression[groups];
        var running = new ParameterExpression[groups];
        var flags = new ParameterExpression[groups];
        var parameters = new ParameterExpression[model.Source.Parameters.Count, groups];
        for (var g = 0; g < groups; g++)
        {
            state[g] = Local(variables, body, vector, vector.Load(x, g * span));
            running[g] = Local(variables, body, vector, vector.Load(product, g * span));
            flags[g] = Local(variables, body, vector, vector.Load(flagged, g * span));
            for (var k = 0; k < parameters.GetLength(0); k++)
            {
                parameters[k, g] = Local(variables, body, vector, vector.Load(p, (k * Groups) + (g * span)));
            }
        }

        var step = LinqExpression.Variable(typeof(int), "step");
        variables.Add(step);
        body.Add(LinqExpression.Assign(step, LinqExpression.Constant(0)));
        var loopBody = new List<LinqExpression>();
        var temporaries = new List<ParameterExpression>();
        for (var g = 0; g < groups; g++)
        {
            var emitter = Emitter(vector, state[g], Enumerable.Range(0, parameters.GetLength(0)).Select(k => parameters[k, g]).ToArray(), Constant);
            if (derivative)
            {
                var growth = LinqExpression.Call(vector.Abs, emitter.Emit(model.Jacobian[0]));
                temporaries.AddRange(emitter.Temporaries);
                loopBody.Add(LinqExpression.Assign(running[g], LinqExpression.Multiply(running[g], growth)));
                var inside = LinqExpression.Call(vector.BitwiseAnd, LinqExpression.Call(vector.GreaterThan, running[g], low), LinqExpression.Call(vector.LessThan, running[g], high));
                loopBody.Add(LinqExpression.Assign(flags[g], LinqExpression.Call(vector.BitwiseOr, flags[g], LinqExpression.Call(vector.OnesComplement, inside))));
            }
        }

        // All derivatives first (they read x before the step), then all the steps: the chains interleave.
        for (var g = 0; g < groups; g++)
        {
            var emitter = Emitter(vector, state[g], Enumerable.Range(0, parameters.GetLength(0)).Select(k => parameters[k, g]).ToArray(), Constant);
            loopBody.Add(LinqExpression.Assign(state[g], emitter.Emit(model.Equations[0])));
            temporaries.AddRange(emitter.Temporaries);
            var bounded = LinqExpression.Call(vector.LessThanOrEqual, LinqExpression.Call(vector.Abs, state[g]), escapeVector);
            loopBody.Add(LinqExpression.Assign(flags[g], LinqExpression.Call(vector.BitwiseOr, flags[g], LinqExpression.Call(vector.OnesComplement, bounded))));
        }

        if (record)
        {
            // window[(slot + step) · Lanes + g · width …] = x_g
            var row = LinqExpression.Multiply(LinqExpression.Add(slot, step), LinqExpression.Constant(Lanes));
            for (var g = 0; g < groups; g++)
            {
                loopBody.Add(LinqExpression.Call(vector.CopyTo, state[g], window, LinqExpression.Add(row, LinqExpression.Constant(g * vector.Width))));
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
        for (var g = 0; g < groups; g++)
        {
            body.AddRange(vector.Store(x, g * span, state[g]));
            body.AddRange(vector.Store(product, g * span, running[g]));
            body.AddRange(vector.Store(flagged, g * span, flags[g]));
        }

        var block = LinqExpression.Block(variables, body);
        return record
            ? LinqExpression.Lambda<TDelegate>(block, x, p, product, flagged, steps, window, slot).Compile()
            : LinqExpression.Lambda<TDelegate>(block, x, p, product, flagged, steps).Compile();
    }

    private static ParameterExpression Local(List<ParameterExpression> variables, List<LinqExpression> body, VectorMethods vector, LinqExpression value)
    {
        var variable = LinqExpression.Variable(vector.Type);
        variables.Add(variable);
        body.Add(LinqExpression.Assign(variable, value));
        return variable;
    }

    /// <summary>The shared emitter over a vector's lanes: the scalar operations, lane-wise; catalog functions lane by lane.</summary>
    private static NodeEmitter Emitter(VectorMethods vector, ParameterExpression x, ParameterExpression[] p, Func<double, ParameterExpression> constant)
    {
        NodeEmitter? emitter = null;
        emitter = new NodeEmitter(
            vector.Type,
            value => constant(value),
            symbol => symbol.Kind switch
            {
                SymbolKind.Variable => x,
                SymbolKind.Parameter => p[symbol.Index],
                _ => throw new ArgumentException("a map has no time"),
            },
            (method, arguments) => PerLane(emitter!, vector, method, arguments));
        return emitter;
    }

    /// <summary>
    /// A function on four lanes: its vector form where the catalog has one with the scalar bits in every lane
    /// (<see cref="FunctionCatalog.LaneMethod"/>), else the scalar method on each lane, reassembled.
    /// </summary>
    internal static LinqExpression PerLane(NodeEmitter emitter, MethodInfo method, IReadOnlyList<LinqExpression> arguments) =>
        PerLane(emitter, VectorMethods.Narrow, method, arguments);

    /// <summary>
    /// <see cref="PerLane(NodeEmitter, MethodInfo, IReadOnlyList{LinqExpression})"/> on a vector of either width: an
    /// eight-lane vector takes the four-lane form on each half.
    /// </summary>
    private static LinqExpression PerLane(NodeEmitter emitter, VectorMethods vector, MethodInfo method, IReadOnlyList<LinqExpression> arguments)
    {
        if (FunctionCatalog.LaneMethod(method) is { } vectorForm && arguments.Count == 1)
        {
            if (vector.Width == Width)
            {
                return LinqExpression.Call(vectorForm, arguments);
            }

            var whole = emitter.Temporary();
            return LinqExpression.Block(
                LinqExpression.Assign(whole, arguments[0]),
                LinqExpression.Call(vector.Join!, LinqExpression.Call(vectorForm, LinqExpression.Call(vector.Lower!, whole)), LinqExpression.Call(vectorForm, LinqExpression.Call(vector.Upper!, whole))));
        }

        var values = arguments.Select(_ => emitter.Temporary()).ToArray();
        var steps = arguments.Select((a, i) => (LinqExpression)LinqExpression.Assign(values[i], a)).ToList();
        var lanes = Enumerable.Range(0, vector.Width).Select(lane => (LinqExpression)LinqExpression.Call(
            method,
            values.Select(v => (LinqExpression)LinqExpression.Call(vector.GetElement, v, LinqExpression.Constant(lane))))).ToArray();
        steps.Add(LinqExpression.Call(vector.Create, lanes));
        return LinqExpression.Block(steps);
    }
}
