namespace Sweeps.Core.Expressions;

/// <summary>The built-in functions of the model language. Nothing else is callable from a model.</summary>
public enum MathFunction
{
    Sin,
    Cos,
    Tan,
    Asin,
    Acos,
    Atan,
    Atan2,
    Sinh,
    Cosh,
    Tanh,
    Exp,
    Log,
    Log10,
    Sqrt,
    Abs,
    Sign,
    Floor,
    Min,
    Max,
    Mod,
    Pow,
}
