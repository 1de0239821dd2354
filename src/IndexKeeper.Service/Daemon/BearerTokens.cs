using System.Security.Cryptography;
using System.Text;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Service.Daemon;

/// <summary>The API's bearer token: from Daemon:TokenFile (first line) or Daemon:Token; compared in constant time.</summary>
public static class BearerTokens
{
    /// <summary>The configured token, or null when none is set.</summary>
    public static string? Resolve(DaemonOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        if (!string.IsNullOrWhiteSpace(options.TokenFile))
        {
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
