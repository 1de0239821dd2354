using System.Net;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Daemon;

/// <summary>
/// DNS rebinding: a page on another origin whose name the attacker re-points at 127.0.0.1 can reach a
/// loopback listener from the operator's browser, but the browser still sends the page's own name in
/// Host (RFC 9110 section 7.2). So a listener without a token answers only requests whose Host names
/// the loopback address or localhost (with a token, the token is the defence: DaemonSecurityTests).
/// </summary>
public sealed class DaemonHostHeaderTests
{
    [Fact]
    public void ATokenlessListenerAnswersOnlyHostsThatNameIt()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        using var daemon = RunningDaemon.Start(temp.Path, ["--root", "store", "--encoder", "hashed-terms"]);
        var port = daemon.Client.BaseAddress!.Port;

        foreach (var host in new[] { $"rebound.example:{port}", "rebound.example", $"127.0.0.1.rebound.example:{port}", $"localhost.:{port}" })
        {
            foreach (var path in new[] { "/api/status", "/health", "/api/search?q=tide", "/" })
            {
                // RFC 9110 section 15.5.20: 421 Misdirected Request, "not able to produce a response for this combination of scheme and authority".
                Assert.Equal(HttpStatusCode.MisdirectedRequest, Status(daemon, path, host));
            }
        }

        foreach (var host in new[] { $"127.0.0.1:{port}", $"localhost:{port}", $"LOCALHOST:{port}", "127.0.0.1" })
        {
            Assert.Equal(HttpStatusCode.OK, Status(daemon, "/api/status", host));
        }

        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
    }

    private static HttpStatusCode Status(RunningDaemon daemon, string path, string host)
    {
        using var request = new HttpRequestMessage(HttpMethod.Get, path);
        request.Headers.Host = host;
        using var response = daemon.Client.Send(request);
        return response.StatusCode;
    }
}
