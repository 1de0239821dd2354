using System.Security.Cryptography;
using System.Text;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Service.Daemon;

/// <summary>The API's bearer token: from Daemon:TokenFile (first line) or Daemon:Token; compared in constant time.</summary>
public static class BearerTokens
{
    /// <summary>Any permission for group or others: what ssh calls an unprotected private key (mode &amp; 077).</summary>
    private const UnixFileMode NotOwner =
        UnixFileMode.GroupRead | UnixFileMode.GroupWrite | UnixFileMode.GroupExecute |
        UnixFileMode.OtherRead | UnixFileMode.OtherWrite | UnixFileMode.OtherExecute;

    /// <summary>
    /// The configured token, or null when none is set. A token file that group or others may read or
    /// write is refused, as ssh refuses such a private key: the token opens the whole index. Windows
    /// has no mode bits; there the file's ACL is the operator's to keep (docs/daemon.md).
    /// </summary>
    public static string? Resolve(DaemonOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        if (!string.IsNullOrWhiteSpace(options.TokenFile))
        {
            if (!OperatingSystem.IsWindows() && File.GetUnixFileMode(options.TokenFile) is var mode && (mode & NotOwner) != 0)
            {
                var octal = Convert.ToString((int)mode, 8).PadLeft(3, '0');
                throw new ConfigurationException([$"Daemon:TokenFile: '{options.TokenFile}' has mode {octal}: users other than its owner may read or change the token; run chmod 600 '{options.TokenFile}' (the service account alone reads it)."]);
            }

            var line = File.ReadLines(options.TokenFile).FirstOrDefault()?.Trim();
            if (string.IsNullOrEmpty(line) || line.Length < 16)
            {
                throw new ConfigurationException([$"Daemon:TokenFile: '{options.TokenFile}' must hold a token of at least 16 characters on its first line."]);
            }

            return line;
        }

        return string.IsNullOrWhiteSpace(options.Token) ? null : options.Token.Trim();
    }

    /// <summary>True when an Authorization header carries exactly the token (RFC 6750 "Bearer" scheme).</summary>
    public static bool Matches(string? authorizationHeader, string token)
    {
        ArgumentNullException.ThrowIfNull(token);
        const string scheme = "Bearer ";
        if (authorizationHeader is null || !authorizationHeader.StartsWith(scheme, StringComparison.OrdinalIgnoreCase))
        {
            return false;
        }

        var given = Encoding.UTF8.GetBytes(authorizationHeader[scheme.Length..].Trim());
        return CryptographicOperations.FixedTimeEquals(given, Encoding.UTF8.GetBytes(token));
    }
}
