using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Daemon;

namespace IndexKeeper.Tests.Daemon;

/// <summary>The Host check of a tokenless listener, as a pure function (Host grammar: RFC 9110 section 7.2, RFC 3986 section 3.2.2).</summary>
public sealed class HostHeaderRuleTests
{
    [Theory]
    [InlineData("127.0.0.1:7717", "127.0.0.1:7717", true)]
    [InlineData("127.0.0.1:7717", "127.0.0.1", true)]
    [InlineData("127.0.0.1:7717", "localhost:7717", true)]
    [InlineData("127.0.0.1:7717", "LocalHost:8080", true)] // an SSH tunnel to another local port
    [InlineData("127.0.0.1:7717", "[::1]:7717", false)]
    [InlineData("127.0.0.1:7717", "127.0.0.2:7717", false)]
    [InlineData("127.0.0.1:7717", "rebound.example:7717", false)]
    [InlineData("127.0.0.1:7717", "localhost.rebound.example:7717", false)]
    [InlineData("127.0.0.1:7717", "127.0.0.1.rebound.example", false)]
    [InlineData("127.0.0.1:7717", "localhost.:7717", false)]
    [InlineData("127.0.0.1:7717", "localhost:77x7", false)]
    [InlineData("127.0.0.1:7717", "localhost:99999", false)]
    [InlineData("127.0.0.1:7717", "localhost@rebound.example", false)]
    [InlineData("127.0.0.1:7717", "", false)]
    [InlineData("127.0.0.1:7717", null, false)]
    [InlineData("[::1]:7717", "[::1]:7717", true)]
    [InlineData("[::1]:7717", "[0:0:0:0:0:0:0:1]:7717", false)] // browsers send the canonical form (RFC 5952)
    [InlineData("[::1]:7717", "localhost:7717", true)]
    [InlineData("[::1]:7717", "127.0.0.1:7717", false)]
    [InlineData("[::1]:7717", "[::1", false)]
    [InlineData("[::1]:7717", "::1", false)]
    [InlineData("localhost:7717", "127.0.0.1:7717", true)]
    public void OnlyTheLoopbackLiteralOrLocalhostIsAnswered(string listen, string? host, bool answered)
    {
        Assert.True(ListenAddress.TryParse(listen, out var address));
        Assert.Equal(answered, HostHeaderRule.Names(host, address!));
    }
}
