namespace Sweeps.Engine.Config;

/// <summary>A config that cannot be used, with every problem found in it (validation does not stop at the first).</summary>
public sealed class ConfigException : Exception
{
    public ConfigException(IReadOnlyList<ConfigProblem> problems)
        : base(string.Join(Environment.NewLine, problems))
    {
        Problems = problems;
    }

    public IReadOnlyList<ConfigProblem> Problems { get; }

    public static ConfigException Single(string file, string message) => new([new ConfigProblem(file, null, message)]);
}
