using System.Net;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Daemon;

/// <summary>Off loopback the API needs a bearer token (RFC 6750); without one configured the daemon refuses to start; with one, nothing else is checked.</summary>
public sealed class DaemonSecurityTests
{
    [Fact]
    public void NonLoopbackListenWithoutATokenRefusesToStart()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        var result = CliRunner.Run(temp.Path, "run", "--index", "index", "--root", "store", "--encoder", "hashed-terms", "--listen", "0.0.0.0:0");
        Assert.Equal(2, result.ExitCode);
        Assert.Contains("Daemon:TokenFile", result.Stderr, StringComparison.Ordinal);
        Assert.False(File.Exists(temp.Combine("index", "daemon.json")));
    }

    [Fact]
    public async Task RequestsWithoutTheRightTokenAreRejected()
    {
        const string token = "moorland-otter-4417-quay";
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        var tokenFile = RunningDaemon.WriteTokenFile(temp, token);
        using var daemon = RunningDaemon.Start(temp.Path, ["--root", "store", "--encoder", "hashed-terms", "--Daemon:TokenFile=" + tokenFile], token);

        // RFC 6750 section 3: a request without (or with a wrong) bearer token gets 401 and a WWW-Authenticate: Bearer challenge.
        using var bare = new HttpClient { BaseAddress = daemon.Client.BaseAddress };
        foreach (var path in new[] { "/api/status", "/metrics", "/health", "/api/search?q=quay", "/api/documents" })
        {
            using var response = await bare.GetAsync(path);
            Assert.Equal(HttpStatusCode.Unauthorized, response.StatusCode);
            Assert.Equal("Bearer", response.Headers.WwwAuthenticate.Single().Scheme);
        }

        using var wrong = new HttpClient { BaseAddress = daemon.Client.BaseAddress };
        wrong.DefaultRequestHeaders.Authorization = new System.Net.Http.Headers.AuthenticationHeaderValue("Bearer", token + "x");
        using var wrongAnswer = await wrong.GetAsync("/api/status");
        Assert.Equal(HttpStatusCode.Unauthorized, wrongAnswer.StatusCode);

        Assert.Equal(0, daemon.GetJson("/api/status").GetProperty("documents").GetInt64());

        // With a token the token is the defence: the Host check of a tokenless listener (DNS rebinding) does not apply.
        using var foreignHost = new HttpRequestMessage(HttpMethod.Get, "/api/status");
        foreignHost.Headers.Host = "indexkeeper.internal.example:443";
        using var answer = await daemon.Client.SendAsync(foreignHost);
        Assert.Equal(HttpStatusCode.OK, answer.StatusCode);

        // The daemon's own warm-up search goes through the same API, so it must carry the token too (docs/daemon.md, "Warm-up").
        daemon.WaitUntil("the warm-up search ends", () => daemon.Stderr.Contains("Serving view warmed", StringComparison.Ordinal) || daemon.Stderr.Contains("not warmed", StringComparison.Ordinal));
        Assert.DoesNotContain("not warmed", daemon.Stderr, StringComparison.Ordinal);
        Assert.Contains("of segments read ahead", daemon.Stderr, StringComparison.Ordinal);
        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
    }
}
