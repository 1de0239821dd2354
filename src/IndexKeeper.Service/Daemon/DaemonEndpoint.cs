using System.Text.Json;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// The file <c>daemon.json</c> in the index directory (docs/daemon.md, version 1): where a running daemon's
/// API answers, so commands that find the index locked can ask it instead. Written once the server
/// listens, removed at exit; a stale file is harmless (the lock says whether a daemon runs).
/// </summary>
public sealed record DaemonEndpoint(int Version, string Url, int ProcessId, bool TokenRequired)
{
    public const string FileName = "daemon.json";

    /// <summary>The format version of the file; never reuse a number.</summary>
    public const int CurrentVersion = 1;

    public static string PathIn(string indexDirectory) => Path.Combine(indexDirectory, FileName);

    /// <summary>The URL a client on this machine uses for the server's bound address (an unspecified address is reached over loopback).</summary>
    public static string ClientUrlOf(string boundUrl)
    {
        ArgumentNullException.ThrowIfNull(boundUrl);
        return boundUrl.Replace("0.0.0.0", "127.0.0.1", StringComparison.Ordinal).Replace("[::]", "[::1]", StringComparison.Ordinal);
    }

    public void Write(string indexDirectory)
    {
        var path = PathIn(indexDirectory);
        var temp = path + ".tmp";
        File.WriteAllText(temp, JsonSerializer.Serialize(this, ApiJson.Options));
        File.Move(temp, path, overwrite: true);
    }

    /// <summary>The endpoint of a daemon of this or an older file version, or null when there is none or it cannot be read.</summary>
    public static DaemonEndpoint? Read(string indexDirectory)
    {
        try
        {
            var endpoint = JsonSerializer.Deserialize<DaemonEndpoint>(File.ReadAllText(PathIn(indexDirectory)), ApiJson.Options);
            return endpoint is { Version: >= 1 and <= CurrentVersion } && Uri.TryCreate(endpoint.Url, UriKind.Absolute, out _) ? endpoint : null;
        }
        catch (Exception ex) when (ex is IOException or JsonException or UnauthorizedAccessException)
        {
            return null;
        }
    }

    public static void Remove(string indexDirectory)
    {
        try
        {
            File.Delete(PathIn(indexDirectory));
        }
        catch (IOException)
        {
            // Stale is harmless: see above.
        }
    }
}
