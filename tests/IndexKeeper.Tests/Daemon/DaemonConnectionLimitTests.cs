using System.Net;
using System.Net.Sockets;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Daemon;

/// <summary>
/// Idle TCP connections (opened, nothing sent: no request, no token) cannot pile up: past
/// Daemon:MaxConnections the server closes them as soon as it accepts them, idle ones are closed after
/// Daemon:IdleTimeoutSeconds, and the API and the work loop carry on. Outcomes only, no timings.
/// </summary>
public sealed class DaemonConnectionLimitTests
{
    private const int IdleSockets = 300;

    [Fact]
    public void IdleConnectionsPastTheCapAreClosedAndTheDaemonCarriesOn()
    {
        const int cap = 8;
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "tide-tables.pdf"), StorePdfs.Document("Saltmarsh", 2));
        using var daemon = RunningDaemon.Start(temp.Path, [
            "--root", "store", "--encoder", "hashed-terms", "--Schedule:Windows:0=Mon-Sun 00:00-24:00", "--Detect:SettleSeconds=0.2",
            $"--Daemon:MaxConnections={cap}", "--Daemon:IdleTimeoutSeconds=600"]);
        daemon.WaitUntil("the first document is embedded", () => daemon.GetJson("/api/status").GetProperty("liveVectorSets").GetInt64() == 2);
        var endpoint = new IPEndPoint(IPAddress.Loopback, daemon.Client.BaseAddress!.Port);

        var sockets = new List<Socket>();
        try
        {
            for (var i = 0; i < IdleSockets; i++)
            {
                var socket = new Socket(AddressFamily.InterNetwork, SocketType.Stream, ProtocolType.Tcp);
                socket.Connect(endpoint);
                sockets.Add(socket);
            }

            // The kernel completes every handshake; the server closes (FIN or RST) each one it will not keep.
            daemon.WaitUntil($"the server has closed at least {IdleSockets - cap} of {IdleSockets} idle connections", () => sockets.Count(ClosedByServer) >= IdleSockets - cap);

            // While the idle ones hold every slot, a request on a new connection is refused too.
            using (var fresh = new HttpClient { BaseAddress = daemon.Client.BaseAddress })
            {
                Assert.ThrowsAny<HttpRequestException>(() => fresh.GetAsync("/health").GetAwaiter().GetResult());
            }
        }
        finally
        {
            foreach (var socket in sockets)
            {
                socket.Dispose();
            }
        }

        // Once they are gone, the API answers again and the work loop is still at work.
        daemon.WaitUntil("/health answers again", () => Answers(daemon, "/health"));
        File.WriteAllBytes(temp.Combine("store", "harbour-dues.pdf"), StorePdfs.Document("Breakwater", 3));
        daemon.WaitUntil("a document added after the flood is embedded", () => daemon.GetJson("/api/status").GetProperty("liveVectorSets").GetInt64() == 5);
        Assert.DoesNotContain("work-loop", daemon.GetText("/health"), StringComparison.Ordinal);
        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
    }

    [Fact]
    public void IdleConnectionsAreClosedAfterTheIdleTimeout()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        using var daemon = RunningDaemon.Start(temp.Path, ["--root", "store", "--encoder", "hashed-terms", "--Daemon:MaxConnections=16", "--Daemon:IdleTimeoutSeconds=1"]);
        var endpoint = new IPEndPoint(IPAddress.Loopback, daemon.Client.BaseAddress!.Port);
        var sockets = new List<Socket>();
        try
        {
            for (var i = 0; i < 16; i++)
            {
                var socket = new Socket(AddressFamily.InterNetwork, SocketType.Stream, ProtocolType.Tcp);
                socket.Connect(endpoint);
                sockets.Add(socket);
            }

            daemon.WaitUntil("the server has closed every idle connection", () => sockets.All(ClosedByServer));
            Assert.True(Answers(daemon, "/health"), "/health should answer once the idle connections are closed");
        }
        finally
        {
            foreach (var socket in sockets)
            {
                socket.Dispose();
            }
        }

        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
    }

    /// <summary>True when the peer has closed: readable with nothing to read (FIN), or reset.</summary>
    private static bool ClosedByServer(Socket socket)
    {
        try
        {
            return socket.Poll(0, SelectMode.SelectRead) && socket.Receive(new byte[1], SocketFlags.Peek) == 0;
        }
        catch (SocketException)
        {
            return true;
        }
    }

    private static bool Answers(RunningDaemon daemon, string path)
    {
        try
        {
            using var fresh = new HttpClient { BaseAddress = daemon.Client.BaseAddress };
            using var response = fresh.GetAsync(path).GetAwaiter().GetResult();
            return response.StatusCode == HttpStatusCode.OK;
        }
        catch (HttpRequestException)
        {
            return false;
        }
    }
}
