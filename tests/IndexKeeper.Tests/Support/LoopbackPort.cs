using System.Net;
using System.Net.Sockets;

namespace IndexKeeper.Tests.Support;

/// <summary>Ports for servers the tests start that cannot be told to pick their own (Prometheus, HttpListener).</summary>
internal static class LoopbackPort
{
    /// <summary>A loopback port free a moment ago (the OS picked it); the server takes it right after.</summary>
    public static int Free()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        return ((IPEndPoint)listener.LocalEndpoint).Port;
    }
}
