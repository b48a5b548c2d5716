using System.Linq.Expressions;
using System.Reflection;
using System.Runtime.Intrinsics;
using LinqExpression = System.Linq.Expressions.Expression;

namespace Sweeps.Core.Kernels;

/// <summary>
/// The vector operations generated lane code calls, for four-lane (<see cref="Vector256{T}"/>) or eight-lane
/// (<see cref="Vector512{T}"/>) vectors of doubles: the map kernel's loops and the flow kernels' stages.
/// </summary>
internal sealed class VectorMethods
{
    // Method handles through delegates: the compiler picks each overload, and nothing scans the vector classes'
    // hundreds of methods by reflection (tens of milliseconds at start).
    public static readonly VectorMethods Narrow = new(typeof(Vector256<double>), 4)
    {
        Abs = Info<Func<Vector256<double>, Vector256<double>>>(Vector256.Abs),
        GreaterThan = Info<Func<Vector256<double>, Vector256<double>, Vector256<double>>>(Vector256.GreaterThan),
        LessThan = Info<Func<Vector256<double>, Vector256<double>, Vector256<double>>>(Vector256.LessThan),
        LessThanOrEqual = Info<Func<Vector256<double>, Vector256<double>, Vector256<double>>>(Vector256.LessThanOrEqual),
        BitwiseAnd = Info<Func<Vector256<double>, Vector256<double>, Vector256<double>>>(Vector256.BitwiseAnd),
        BitwiseOr = Info<Func<Vector256<double>, Vector256<double>, Vector256<double>>>(Vector256.BitwiseOr),
        OnesComplement = Info<Func<Vector256<double>, Vector256<double>>>(Vector256.OnesComplement),
        GetElement = Info<Func<Vector256<double>, int, double>>(Vector256.GetElement),
        Create = Info<Func<double, double, double, double, Vector256<double>>>(Vector256.Create),
        CopyTo = Info<Action<Vector256<double>, double[], int>>(Vector256.CopyTo),
        Broadcast = Info<Func<double, Vector256<double>>>(Vector256.Create),
    };

    public static readonly VectorMethods Wide = new(typeof(Vector512<double>), 8)
    {
        Abs = Info<Func<Vector512<double>, Vector512<double>>>(Vector512.Abs),
        GreaterThan = Info<Func<Vector512<double>, Vector512<double>, Vector512<double>>>(Vector512.GreaterThan),
        LessThan = Info<Func<Vector512<double>, Vector512<double>, Vector512<double>>>(Vector512.LessThan),
        LessThanOrEqual = Info<Func<Vector512<double>, Vector512<double>, Vector512<double>>>(Vector512.LessThanOrEqual),
        BitwiseAnd = Info<Func<Vector512<double>, Vector512<double>, Vector512<double>>>(Vector512.BitwiseAnd),
        BitwiseOr = Info<Func<Vector512<double>, Vector512<double>, Vector512<double>>>(Vector512.BitwiseOr),
        OnesComplement = Info<Func<Vector512<double>, Vector512<double>>>(Vector512.OnesComplement),
        GetElement = Info<Func<Vector512<double>, int, double>>(Vector512.GetElement),
        Create = Info<Func<double, double, double, double, double, double, double, double, Vector512<double>>>(Vector512.Create),
        CopyTo = Info<Action<Vector512<double>, double[], int>>(Vector512.CopyTo),
        Broadcast = Info<Func<double, Vector512<double>>>(Vector512.Create),
        Join = Info<Func<Vector256<double>, Vector256<double>, Vector512<double>>>(Vector512.Create),
        Lower = Info<Func<Vector512<double>, Vector256<double>>>(Vector512.GetLower),
        Upper = Info<Func<Vector512<double>, Vector256<double>>>(Vector512.GetUpper),
    };

    private VectorMethods(Type type, int width)
    {
        Type = type;
        Width = width;
    }

    public Type Type { get; }

    public int Width { get; }

    public required MethodInfo Abs { get; init; }

    public required MethodInfo GreaterThan { get; init; }

    public required MethodInfo LessThan { get; init; }

    public required MethodInfo LessThanOrEqual { get; init; }

    public required MethodInfo BitwiseAnd { get; init; }

    public required MethodInfo BitwiseOr { get; init; }

    public required MethodInfo OnesComplement { get; init; }

    public required MethodInfo GetElement { get; init; }

    public required MethodInfo Create { get; init; }

    public required MethodInfo CopyTo { get; init; }

    public required MethodInfo Broadcast { get; init; }

    /// <summary>Two four-lane halves into one wide vector (wide only).</summary>
    public MethodInfo? Join { get; init; }

    public MethodInfo? Lower { get; init; }

    public MethodInfo? Upper { get; init; }

    /// <summary>The vector made of the four-lane vectors <paramref name="array"/>[first …]: one of them, or two joined.</summary>
    public LinqExpression Load(ParameterExpression array, int first) =>
        Join is null
            ? LinqExpression.ArrayIndex(array, LinqExpression.Constant(first))
            : LinqExpression.Call(Join, LinqExpression.ArrayIndex(array, LinqExpression.Constant(first)), LinqExpression.ArrayIndex(array, LinqExpression.Constant(first + 1)));

    /// <summary>Stores <paramref name="value"/> back into <paramref name="array"/>[first …] (the inverse of <see cref="Load"/>).</summary>
    public IEnumerable<LinqExpression> Store(ParameterExpression array, int first, ParameterExpression value)
    {
        if (Join is null)
        {
            yield return LinqExpression.Assign(LinqExpression.ArrayAccess(array, LinqExpression.Constant(first)), value);
            yield break;
        }

        yield return LinqExpression.Assign(LinqExpression.ArrayAccess(array, LinqExpression.Constant(first)), LinqExpression.Call(Lower!, value));
        yield return LinqExpression.Assign(LinqExpression.ArrayAccess(array, LinqExpression.Constant(first + 1)), LinqExpression.Call(Upper!, value));
    }

    private static MethodInfo Info<TDelegate>(TDelegate method)
        where TDelegate : Delegate => method.Method;
}
