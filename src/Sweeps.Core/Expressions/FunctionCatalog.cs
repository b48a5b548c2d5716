using System.Reflection;

namespace Sweeps.Core.Expressions;

/// <summary>
/// Names, arities and implementations of the built-in functions. The reference evaluator and the
/// compiler both call the methods listed here, so interpreted and compiled results agree exactly.
/// </summary>
public static class FunctionCatalog
{
    private static readonly Dictionary<string, MathFunction> ByName = new(StringComparer.Ordinal)
    {
        ["sin"] = MathFunction.Sin,
        ["cos"] = MathFunction.Cos,
        ["tan"] = MathFunction.Tan,
        ["asin"] = MathFunction.Asin,
        ["acos"] = MathFunction.Acos,
        ["atan"] = MathFunction.Atan,
        ["atan2"] = MathFunction.Atan2,
        ["sinh"] = MathFunction.Sinh,
        ["cosh"] = MathFunction.Cosh,
        ["tanh"] = MathFunction.Tanh,
        ["exp"] = MathFunction.Exp,
        ["log"] = MathFunction.Log,
        ["log10"] = MathFunction.Log10,
        ["sqrt"] = MathFunction.Sqrt,
        ["abs"] = MathFunction.Abs,
        ["sign"] = MathFunction.Sign,
        ["floor"] = MathFunction.Floor,
        ["min"] = MathFunction.Min,
        ["max"] = MathFunction.Max,
        ["mod"] = MathFunction.Mod,
        ["pow"] = MathFunction.Pow,
    };

    /// <summary>Every function name of the language.</summary>
    public static IEnumerable<string> Names => ByName.Keys;

    public static bool TryGet(string name, out MathFunction function) => ByName.TryGetValue(name, out function);

    public static string NameOf(MathFunction function) => function.ToString().ToLowerInvariant();

    public static int Arity(MathFunction function) => function switch
    {
        MathFunction.Atan2 or MathFunction.Min or MathFunction.Max or MathFunction.Mod or MathFunction.Pow => 2,
        _ => 1,
    };

    /// <summary>sign(x): −1, 0 or 1, and NaN for NaN (Math.Sign throws on NaN).</summary>
    public static double Sign(double x) => x > 0 ? 1.0 : x < 0 ? -1.0 : x == 0 ? 0.0 : double.NaN;

    /// <summary>
    /// min with IEEE 754-2019 semantics (NaN if either is NaN, −0 below +0), written out because the
    /// JIT's Math.Min intrinsic treated signed zeros differently in compiled and ordinary code.
    /// </summary>
    public static double Min(double a, double b) =>
        a < b ? a : b < a ? b : double.IsNaN(a) || double.IsNaN(b) ? double.NaN : double.IsNegative(a) ? a : b;

    /// <summary>max with IEEE 754-2019 semantics (NaN if either is NaN, +0 above −0).</summary>
    public static double Max(double a, double b) =>
        a > b ? a : b > a ? b : double.IsNaN(a) || double.IsNaN(b) ? double.NaN : double.IsNegative(a) ? b : a;

    /// <summary>Floored modulo: the result has the sign of <paramref name="b"/>, so mod(x, 1) lies in [0, 1).</summary>
    public static double Mod(double a, double b) => a - b * Math.Floor(a / b);

    internal static MethodInfo Method(MathFunction function) => function switch
    {
        MathFunction.Sin => Info(Trigonometry.Sin),
        MathFunction.Cos => Info(Trigonometry.Cos),
        MathFunction.Tan => Info(Math.Tan),
        MathFunction.Asin => Info(Math.Asin),
        MathFunction.Acos => Info(Math.Acos),
        MathFunction.Atan => Info(Math.Atan),
        MathFunction.Atan2 => Info2(Math.Atan2),
        MathFunction.Sinh => Info(Math.Sinh),
        MathFunction.Cosh => Info(Math.Cosh),
        MathFunction.Tanh => Info(Math.Tanh),
        MathFunction.Exp => Info(Math.Exp),
        MathFunction.Log => Info(Math.Log),
        MathFunction.Log10 => Info(Math.Log10),
        MathFunction.Sqrt => Info(Math.Sqrt),
        MathFunction.Abs => Info(Math.Abs),
        MathFunction.Sign => Info(Sign),
        MathFunction.Floor => Info(Math.Floor),
        MathFunction.Min => Info2(Min),
        MathFunction.Max => Info2(Max),
        MathFunction.Mod => Info2(Mod),
        MathFunction.Pow => Info2(Math.Pow),
        _ => throw new ArgumentOutOfRangeException(nameof(function)),
    };

    /// <summary>Evaluates a function on already evaluated arguments.</summary>
    public static double Apply(MathFunction function, double a, double b = double.NaN) => function switch
    {
        MathFunction.Sin => Trigonometry.Sin(a),
        MathFunction.Cos => Trigonometry.Cos(a),
        MathFunction.Tan => Math.Tan(a),
        MathFunction.Asin => Math.Asin(a),
        MathFunction.Acos => Math.Acos(a),
        MathFunction.Atan => Math.Atan(a),
        MathFunction.Atan2 => Math.Atan2(a, b),
        MathFunction.Sinh => Math.Sinh(a),
        MathFunction.Cosh => Math.Cosh(a),
        MathFunction.Tanh => Math.Tanh(a),
        MathFunction.Exp => Math.Exp(a),
        MathFunction.Log => Math.Log(a),
        MathFunction.Log10 => Math.Log10(a),
        MathFunction.Sqrt => Math.Sqrt(a),
        MathFunction.Abs => Math.Abs(a),
        MathFunction.Sign => Sign(a),
        MathFunction.Floor => Math.Floor(a),
        MathFunction.Min => Min(a, b),
        MathFunction.Max => Max(a, b),
        MathFunction.Mod => Mod(a, b),
        MathFunction.Pow => Math.Pow(a, b),
        _ => throw new ArgumentOutOfRangeException(nameof(function)),
    };

    /// <summary>
    /// The four-lane form of a catalog method, where one gives every lane the scalar method's bits from that lane's
    /// value alone (sine and cosine); null for the others, which run lane by lane.
    /// </summary>
    internal static MethodInfo? LaneMethod(MethodInfo scalar) =>
        scalar == Info(Trigonometry.Sin) ? LaneInfo(Trigonometry.Sin)
        : scalar == Info(Trigonometry.Cos) ? LaneInfo(Trigonometry.Cos)
        : null;

    private static MethodInfo Info(Func<double, double> f) => f.Method;

    private static MethodInfo LaneInfo(Func<System.Runtime.Intrinsics.Vector256<double>, System.Runtime.Intrinsics.Vector256<double>> f) => f.Method;

    private static MethodInfo Info2(Func<double, double, double> f) => f.Method;
}
