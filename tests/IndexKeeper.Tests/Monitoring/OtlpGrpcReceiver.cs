using System.Collections.Concurrent;
using System.Net;
using Grpc.Core;
using IndexKeeper.Tests.Monitoring.Otlp;
using IndexKeeper.Tests.Support;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Server.Kestrel.Core;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;

namespace IndexKeeper.Tests.Monitoring;

/// <summary>
/// An OTLP/gRPC receiver (OpenTelemetry Protocol specification, "OTLP/gRPC"): the metrics and trace collector
/// services of the open OTLP definitions (otlp_*_subset.proto), served over HTTP/2 without TLS by the gRPC
/// library for ASP.NET Core, an implementation of the gRPC protocol independent of the exporter's own. It
/// keeps the metric and span names of every request it accepts.
/// </summary>
internal sealed class OtlpGrpcReceiver : IAsyncDisposable
{
    private readonly WebApplication app;

    public OtlpGrpcReceiver()
    {
        Port = LoopbackPort.Free();
        var builder = WebApplication.CreateSlimBuilder();
        builder.Logging.ClearProviders();
        builder.WebHost.ConfigureKestrel(k => k.Listen(IPAddress.Loopback, Port, l => l.Protocols = HttpProtocols.Http2));
        builder.Services.AddGrpc();
        builder.Services.AddSingleton(this);
        app = builder.Build();
        app.MapGrpcService<MetricsCollector>();
        app.MapGrpcService<TraceCollector>();
        app.StartAsync().GetAwaiter().GetResult();
    }

    public int Port { get; }

    public ConcurrentBag<string> MetricNames { get; } = [];

    public ConcurrentBag<string> SpanNames { get; } = [];

    /// <summary>Headers of the requests, as gRPC metadata (lower-case keys).</summary>
    public ConcurrentBag<KeyValuePair<string, string>> Headers { get; } = [];

    public async ValueTask DisposeAsync()
    {
        await app.StopAsync().ConfigureAwait(false);
        await app.DisposeAsync().ConfigureAwait(false);
    }

    private void Note(ServerCallContext context) =>
        context.RequestHeaders.Where(h => !h.IsBinary).ToList().ForEach(h => Headers.Add(new(h.Key, h.Value)));

    private sealed class MetricsCollector(OtlpGrpcReceiver receiver) : MetricsService.MetricsServiceBase
    {
        public override Task<ExportMetricsServiceResponse> Export(ExportMetricsServiceRequest request, ServerCallContext context)
        {
            receiver.Note(context);
            foreach (var metric in request.ResourceMetrics.SelectMany(r => r.ScopeMetrics).SelectMany(s => s.Metrics))
            {
                receiver.MetricNames.Add(metric.Name);
            }

            return Task.FromResult(new ExportMetricsServiceResponse());
        }
    }

    private sealed class TraceCollector(OtlpGrpcReceiver receiver) : TraceService.TraceServiceBase
    {
        public override Task<ExportTraceServiceResponse> Export(ExportTraceServiceRequest request, ServerCallContext context)
        {
            receiver.Note(context);
            foreach (var span in request.ResourceSpans.SelectMany(r => r.ScopeSpans).SelectMany(s => s.Spans))
            {
                receiver.SpanNames.Add(span.Name);
            }

            return Task.FromResult(new ExportTraceServiceResponse());
        }
    }
}
