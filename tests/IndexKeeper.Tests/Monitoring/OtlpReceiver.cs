using System.Collections.Concurrent;
using System.Net;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Monitoring;

/// <summary>
/// A minimal OTLP/HTTP receiver (OpenTelemetry Protocol specification, "OTLP/HTTP"): accepts POSTs, answers 200
/// with an empty body, and keeps each request's path, content type, headers and bytes for the test to read.
/// </summary>
internal sealed class OtlpReceiver : IDisposable
{
    private readonly HttpListener listener = new();
    private readonly Task loop;

    public OtlpReceiver()
    {
        Port = LoopbackPort.Free();
        listener.Prefixes.Add($"http://127.0.0.1:{Port}/");
        listener.Start();
        loop = Task.Run(Serve);
    }

    public int Port { get; }

    public ConcurrentQueue<OtlpRequest> Requests { get; } = new();

    public void Dispose()
    {
        listener.Close();
        try
        {
            loop.Wait(TimeSpan.FromSeconds(5));
        }
        catch (AggregateException)
        {
            // The listener was closed under a pending GetContextAsync: the loop's normal end.
        }
    }

    private async Task Serve()
    {
        while (listener.IsListening)
        {
            HttpListenerContext context;
            try
            {
                context = await listener.GetContextAsync().ConfigureAwait(false);
            }
            catch (Exception ex) when (ex is HttpListenerException or ObjectDisposedException or InvalidOperationException)
            {
                return;
            }

            using var body = new MemoryStream();
            await context.Request.InputStream.CopyToAsync(body).ConfigureAwait(false);
            Requests.Enqueue(new OtlpRequest(
                context.Request.Url!.AbsolutePath,
                context.Request.ContentType ?? string.Empty,
                context.Request.Headers.AllKeys.Where(k => k is not null).ToDictionary(k => k!, k => context.Request.Headers[k] ?? string.Empty, StringComparer.OrdinalIgnoreCase),
                body.ToArray()));
            context.Response.StatusCode = 200;
            context.Response.ContentType = "application/x-protobuf";
            context.Response.Close();
        }
    }
}
