namespace Sweeps.Cli;

/// <summary>The process exit codes, part of the CLI contract.</summary>
internal static class ExitCodes
{
    public const int Success = 0;
    public const int Failed = 1;
    public const int BadInput = 2;
}
