namespace Sweeps.Engine.Config;

/// <summary>A value read from a TOML file, with the position it was written at.</summary>
internal abstract record ConfigValue(SourcePosition Position)
{
    /// <summary>The TOML type as a user would name it, for error messages.</summary>
    public abstract string TypeName { get; }
}
