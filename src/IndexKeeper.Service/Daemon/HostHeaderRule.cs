using System.Globalization;
using System.Net;
using System.Net.Sockets;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// The DNS rebinding defence of a listener without a token. A page on another origin can have its name
/// re-pointed at 127.0.0.1 and then reach the loopback listener from the operator's browser, but the
/// browser still sends the page's own name in <c>Host</c> (RFC 9110 section 7.2). So such a listener
/// answers only a Host that is its loopback literal or <c>localhost</c>. Any port is accepted: a rebinding
/// page must use the listener's own port anyway, and an SSH tunnel to another local port stays usable.
/// Pure: a header and an address in, a verdict out.
/// </summary>
internal static class HostHeaderRule
{
    public static bool Names(string? host, ListenAddress listen)
    {
        ArgumentNullException.ThrowIfNull(listen);
        if (string.IsNullOrEmpty(host))
        {
            return false;
        }

        // Host = uri-host [ ":" port ] (RFC 9110 section 7.2); an IPv6 literal is bracketed (RFC 3986 section 3.2.2).
        var portStart = host.StartsWith('[') ? host.IndexOf(']', StringComparison.Ordinal) + 1 : host.LastIndexOf(':') is var colon and >= 0 ? colon : host.Length;
        if (portStart <= 0)
        {
            return false;
        }

        var port = host[portStart..];
        if (port.Length > 0 && (port[0] != ':' || !ushort.TryParse(port.AsSpan(1), NumberStyles.None, CultureInfo.InvariantCulture, out _)))
        {
            return false;
        }

        var name = host[..portStart];
        return name.Equals("localhost", StringComparison.OrdinalIgnoreCase) || name.Equals(Literal(listen.Address), StringComparison.OrdinalIgnoreCase);
    }

    private static string Literal(IPAddress address) =>
        address.AddressFamily == AddressFamily.InterNetworkV6 ? "[" + address + "]" : address.ToString();
}
