using System.Net;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Daemon;

namespace IndexKeeper.Tests.Configuration;

/// <summary>The daemon's settings: listen addresses, the token rule off loopback, and bearer token matching (RFC 6750).</summary>
public sealed class DaemonSettingsTests
{
    [Theory]
    [InlineData("127.0.0.1:7717", "127.0.0.1", 7717, true)]
    [InlineData("localhost:80", "127.0.0.1", 80, true)]
    [InlineData("[::1]:7717", "::1", 7717, true)]
    [InlineData("0.0.0.0:7717", "0.0.0.0", 7717, false)]
    [InlineData("192.0.2.10:0", "192.0.2.10", 0, false)]
    public void ListenAddressesParse(string text, string address, int port, bool loopback)
    {
        Assert.True(ListenAddress.TryParse(text, out var parsed));
        Assert.Equal(IPAddress.Parse(address), parsed!.Address);
        Assert.Equal(port, parsed.Port);
        Assert.Equal(loopback, parsed.IsLoopback);
    }

    [Theory]
    [InlineData("")]
    [InlineData("7717")]
    [InlineData("example.org:7717")]
    [InlineData("127.0.0.1:70000")]
    [InlineData("127.0.0.1:-1")]
    [InlineData("127.0.0.1:")]
    [InlineData("::1:7717")] // RFC 3986 section 3.2.2: an IPv6 literal in a host:port goes in brackets.
    [InlineData("[127.0.0.1]:7717")]
    [InlineData("::ffff:127.0.0.1:7717")]
    [InlineData("[::ffff:127.0.0.1]:7717")] // RFC 4291 section 2.5.5.2: an IPv4-mapped address; the IPv4 address is what is meant.
    public void BadListenAddressesAreNamed(string text)
    {
        var errors = IndexKeeperOptionsValidator.Validate(Valid(o => o.Daemon.Listen = text));
        Assert.Contains(errors, e => e.StartsWith("Daemon:Listen:", StringComparison.Ordinal));
    }

    [Fact]
    public void OffLoopbackATokenIsRequired()
    {
        Assert.Contains(IndexKeeperOptionsValidator.Validate(Valid(o => o.Daemon.Listen = "0.0.0.0:7717")), e => e.StartsWith("Daemon:TokenFile:", StringComparison.Ordinal));
        Assert.Empty(IndexKeeperOptionsValidator.Validate(Valid(o =>
        {
            o.Daemon.Listen = "0.0.0.0:7717";
            o.Daemon.Token = "a-token-of-twenty-chars";
        })));
        Assert.Contains(IndexKeeperOptionsValidator.Validate(Valid(o => o.Daemon.Token = "short")), e => e.StartsWith("Daemon:Token:", StringComparison.Ordinal));
    }

    [Fact]
    public void EveryBadDaemonSettingIsReportedAtOnce()
    {
        var errors = IndexKeeperOptionsValidator.Validate(Valid(o =>
        {
            o.Daemon.LogFormat = "xml";
            o.Daemon.OtlpProtocol = "http/json";
            o.Daemon.ShutdownGraceSeconds = 0;
            o.Daemon.MaxAttempts = 0;
            o.Daemon.MaxConnections = 0;
            o.Daemon.IdleTimeoutSeconds = 0.5;
            o.Detect.FullWalkMinutes = 0;
            o.Detect.WatcherBufferKilobytes = 1;
        }));
        foreach (var name in new[] { "Daemon:LogFormat", "Daemon:OtlpProtocol", "Daemon:ShutdownGraceSeconds", "Daemon:MaxAttempts", "Daemon:MaxConnections", "Daemon:IdleTimeoutSeconds", "Detect:FullWalkMinutes", "Detect:WatcherBufferKilobytes" })
        {
            Assert.Contains(errors, e => e.StartsWith(name + ":", StringComparison.Ordinal));
        }
    }

    [Theory]
    [InlineData("Bearer moorland-otter-4417-quay", true)]
    [InlineData("bearer moorland-otter-4417-quay", true)] // RFC 6750 section 2.1 via RFC 7235: the scheme is case-insensitive.
    [InlineData("Bearer moorland-otter-4417-qua", false)]
    [InlineData("Bearer moorland-otter-4417-quay2", false)]
    [InlineData("Basic bW9vcmxhbmQ=", false)]
    [InlineData("moorland-otter-4417-quay", false)]
    [InlineData(null, false)]
    public void BearerTokenMatching(string? header, bool matches) =>
        Assert.Equal(matches, BearerTokens.Matches(header, "moorland-otter-4417-quay"));

    private static IndexKeeperOptions Valid(Action<IndexKeeperOptions> change)
    {
        var options = new IndexKeeperOptions { IndexDirectory = "/var/lib/indexkeeper/index", Roots = [new RootOptions { Name = "scans", Path = "/srv/scans" }] };
        change(options);
        return options;
    }
}
