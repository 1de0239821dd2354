using System.Collections;
using IndexKeeper.Core.Telemetry;
using IndexKeeper.Service.Configuration;
using Microsoft.Extensions.Configuration;
using OpenTelemetry;
using OpenTelemetry.Exporter;
using OpenTelemetry.Metrics;
using OpenTelemetry.Resources;
using OpenTelemetry.Trace;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// OTLP export of the daemon's metrics and traces (docs/observability.md). <c>Daemon:OtlpEndpoint</c> and
/// <c>Daemon:OtlpProtocol</c> win; without them the standard variables of the OpenTelemetry specification
/// (OTEL_EXPORTER_OTLP_ENDPOINT, _PROTOCOL, _HEADERS, _TIMEOUT and their per-signal forms, OTEL_METRIC_EXPORT_INTERVAL,
/// OTEL_SERVICE_NAME, OTEL_RESOURCE_ATTRIBUTES) decide, read by the OpenTelemetry exporter itself.
/// </summary>
internal static class OtlpExport
{
    /// <summary>Paths OTLP/HTTP appends to a base URL per signal (OTLP specification, "OTLP/HTTP Request").</summary>
    private const string MetricsPath = "v1/metrics";
    private const string TracesPath = "v1/traces";

    /// <summary>
    /// The OTEL_* variables as configuration keys: the host's configuration holds only IndexKeeper's own settings
    /// (no surprises from other variables), and the exporter reads its options from that configuration.
    /// </summary>
    public static IEnumerable<KeyValuePair<string, string?>> StandardVariables(IDictionary environment) =>
        environment.Cast<DictionaryEntry>()
            .Select(e => new KeyValuePair<string, string?>((string)e.Key, e.Value as string))
            .Where(e => e.Key.StartsWith("OTEL_", StringComparison.Ordinal));

    /// <summary>Prometheus scraping always; OTLP when the settings or the standard variables name an endpoint.</summary>
    public static void Configure(OpenTelemetryBuilder telemetry, DaemonOptions daemon, IConfiguration standard)
    {
        ArgumentNullException.ThrowIfNull(telemetry);
        ArgumentNullException.ThrowIfNull(daemon);
        ArgumentNullException.ThrowIfNull(standard);
        if (string.IsNullOrEmpty(standard["OTEL_SERVICE_NAME"]))
        {
            telemetry.ConfigureResource(r => r.AddService("indexkeeper"));
        }

        var endpoint = string.IsNullOrWhiteSpace(daemon.OtlpEndpoint) ? null : new Uri(daemon.OtlpEndpoint);
        var http = daemon.OtlpProtocol == "http/protobuf";
        var metrics = endpoint is not null || !string.IsNullOrEmpty(standard["OTEL_EXPORTER_OTLP_ENDPOINT"] ?? standard["OTEL_EXPORTER_OTLP_METRICS_ENDPOINT"]);
        var traces = endpoint is not null || !string.IsNullOrEmpty(standard["OTEL_EXPORTER_OTLP_ENDPOINT"] ?? standard["OTEL_EXPORTER_OTLP_TRACES_ENDPOINT"]);
        telemetry.WithMetrics(m =>
        {
            m.AddMeter(CoreTelemetry.Name).AddPrometheusExporter();
            if (metrics)
            {
                m.AddOtlpExporter(o => Apply(o, endpoint, http, MetricsPath));
            }
        });
        if (traces)
        {
            telemetry.WithTracing(t => t.AddSource(CoreTelemetry.Name).AddOtlpExporter(o => Apply(o, endpoint, http, TracesPath)));
        }
    }

    /// <summary>Our settings over what the exporter read from the standard variables; nothing when they are not set.</summary>
    private static void Apply(OtlpExporterOptions options, Uri? endpoint, bool http, string signalPath)
    {
        if (endpoint is null)
        {
            return;
        }

        options.Protocol = http ? OtlpExportProtocol.HttpProtobuf : OtlpExportProtocol.Grpc;

        // The exporter takes a URL set in code as the full signal URL; our setting is a base URL, as the standard variable is.
        options.Endpoint = http ? new Uri(endpoint.AbsoluteUri.TrimEnd('/') + "/" + signalPath) : endpoint;
    }
}
