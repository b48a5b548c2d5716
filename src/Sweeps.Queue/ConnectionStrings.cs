using System.Text.RegularExpressions;

namespace Sweeps.Queue;

/// <summary>Connection strings for display: passwords never reach logs, manifests or error messages.</summary>
public static partial class ConnectionStrings
{
    /// <summary>The connection string with every password value replaced by ***.</summary>
    public static string Mask(string connection) => Password().Replace(connection, "$1=***");

    /// <summary>Replaces any occurrence of the connection string's password inside a message.</summary>
    public static string Scrub(string message, string connection)
    {
        foreach (Match match in Password().Matches(connection))
        {
            var secret = match.Groups[2].Value;
            if (secret.Length > 0)
            {
                message = message.Replace(secret, "***", StringComparison.Ordinal);
            }
        }

        return message.Replace(connection, Mask(connection), StringComparison.Ordinal);
    }

    [GeneratedRegex(@"((?:^|;)\s*(?:password|pwd)\s*)=\s*([^;]*)", RegexOptions.IgnoreCase)]
    private static partial Regex Password();
}
