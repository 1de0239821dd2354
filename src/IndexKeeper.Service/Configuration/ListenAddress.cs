using System.Globalization;
using System.Net;

namespace IndexKeeper.Service.Configuration;

/// <summary>The daemon's HTTP address: an IP literal (IPv6 in brackets, and only there) or <c>localhost</c>, and a port.</summary>
public sealed record ListenAddress(IPAddress Address, int Port)
{
    public bool IsLoopback => IPAddress.IsLoopback(Address);

    /// <summary>The base URL a client uses (an unspecified address is reached over loopback).</summary>
    public string ClientUrl
    {
        get
        {
            var host = Address.Equals(IPAddress.Any) ? IPAddress.Loopback : Address.Equals(IPAddress.IPv6Any) ? IPAddress.IPv6Loopback : Address;
            var text = host.AddressFamily == System.Net.Sockets.AddressFamily.InterNetworkV6 ? $"[{host}]" : host.ToString();
            return string.Create(CultureInfo.InvariantCulture, $"http://{text}:{Port}");
        }
    }

    public static bool TryParse(string? text, out ListenAddress? address)
    {
        address = null;
        if (string.IsNullOrWhiteSpace(text))
        {
            return false;
        }

        var colon = text.LastIndexOf(':');
        if (colon <= 0 || !int.TryParse(text.AsSpan(colon + 1), NumberStyles.None, CultureInfo.InvariantCulture, out var port) || port is < 0 or > 65535)
        {
            return false;
        }

        // An IPv6 literal goes in brackets (RFC 3986 section 3.2.2): "::1:7717" could be an address with no port.
        var host = text[..colon];
        var bracketed = host.StartsWith('[') && host.EndsWith(']');
        if (bracketed)
        {
            host = host[1..^1];
        }

        IPAddress? ip = host.Equals("localhost", StringComparison.OrdinalIgnoreCase) ? IPAddress.Loopback : null;
        if (ip is null && (!IPAddress.TryParse(host, out ip) || (ip.AddressFamily == System.Net.Sockets.AddressFamily.InterNetworkV6) != bracketed))
        {
            return false;
        }

        address = new ListenAddress(ip, port);
        return true;
    }
}
