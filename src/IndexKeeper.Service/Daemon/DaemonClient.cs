using System.Net.Http.Headers;
using System.Text.Json;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// How a command asks the daemon that holds an index (found through its endpoint file) instead of opening
/// the index itself: read-only questions only; writes stay with the one process holding the lock.
/// </summary>
public sealed class DaemonClient : IDisposable
{
    /// <summary>The purpose the daemon writes into the lock's owner file.</summary>
    public const string LockPurpose = "indexkeeper run";

    private readonly HttpClient client;

    private DaemonClient(Uri url, string? token, TimeSpan? timeout = null)
    {
        client = new HttpClient { BaseAddress = url, Timeout = timeout ?? TimeSpan.FromMinutes(2) };
        if (token is not null)
        {
            client.DefaultRequestHeaders.Authorization = new AuthenticationHeaderValue("Bearer", token);
        }
    }

    public Uri Url => client.BaseAddress!;

    /// <summary>A client for the daemon of the configured index, or null when no daemon endpoint is recorded there.</summary>
    public static DaemonClient? ForIndex(IndexKeeperOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        return DaemonEndpoint.Read(Path.GetFullPath(options.IndexDirectory)) is { } endpoint
            ? new DaemonClient(new Uri(endpoint.Url), endpoint.TokenRequired ? BearerTokens.Resolve(options.Daemon) ?? throw new ConfigurationException(
                ["Daemon:TokenFile: the daemon holding this index wants a bearer token; set Daemon:TokenFile or INDEXKEEPER_Daemon__Token for this command too."]) : null)
            : null;
    }

    /// <summary>A client for the API at <paramref name="url"/>: the daemon's own, for its warm-up search, which may build the serving view.</summary>
    internal static DaemonClient At(Uri url, string? token, TimeSpan timeout) => new(url, token, timeout);

    /// <summary>GETs a path and reads the JSON answer; an unreachable or failing daemon is an <see cref="IOException"/> naming it.</summary>
    public T Get<T>(string pathAndQuery)
    {
        try
        {
            using var response = client.GetAsync(pathAndQuery).GetAwaiter().GetResult();
            var body = response.Content.ReadAsStringAsync().GetAwaiter().GetResult();
            if (!response.IsSuccessStatusCode)
            {
                throw new IOException($"the daemon at {Url} answered {(int)response.StatusCode} to {pathAndQuery}: {body.Trim()}");
            }

            return JsonSerializer.Deserialize<T>(body, ApiJson.Options) ?? throw new IOException($"the daemon at {Url} sent an empty answer to {pathAndQuery}");
        }
        catch (HttpRequestException ex)
        {
            throw new IOException($"the daemon holding the index does not answer at {Url} ({ex.Message})", ex);
        }
        catch (JsonException ex)
        {
            throw new IOException($"the daemon at {Url} sent JSON this build cannot read ({ex.Message})", ex);
        }
    }

    public void Dispose() => client.Dispose();
}
