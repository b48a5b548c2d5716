namespace Sweeps.Engine.Config;

/// <summary>A string, integer (long), float (double) or boolean value.</summary>
internal sealed record ConfigScalar(object Value, SourcePosition Position) : ConfigValue(Position)
{
    public override string TypeName => Value switch
    {
        string => "a string",
        long => "an integer",
        double => "a float",
        bool => "a boolean",
        _ => "a date or time",
    };
}
