using IndexKeeper.Tests.Daemon;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Monitoring;

/// <summary>
/// OTLP over http/protobuf from a real daemon into a receiver in the test: once from IndexKeeper's own settings,
/// once from the standard OTEL_EXPORTER_OTLP_* variables alone; and over gRPC into the OTLP collector services
/// (<see cref="OtlpGrpcReceiver"/>) (OpenTelemetry specification, "OpenTelemetry
/// Protocol Exporter" configuration: endpoint, protocol, headers; OTEL_METRIC_EXPORT_INTERVAL in milliseconds).
/// </summary>
public sealed class OtlpExportTests
{
    [Fact]
    public void MetricsAndTracesGoOutOverHttpProtobufFromTheSettings()
    {
        using var receiver = new OtlpReceiver();
        var requests = Export(
            ["--Daemon:OtlpEndpoint=http://127.0.0.1:" + receiver.Port, "--Daemon:OtlpProtocol=http/protobuf"],
            new Dictionary<string, string> { ["OTEL_METRIC_EXPORT_INTERVAL"] = "300" },
            receiver);
        Assert.All(requests, r => Assert.Equal("application/x-protobuf", r.ContentType));
        Assert.Contains(requests, r => r.Path == "/v1/metrics" && r.Carries("indexkeeper.pages.embedded") && r.Carries("indexkeeper"));
        Assert.Contains(requests, r => r.Path == "/v1/traces" && r.Carries("embed batch"));
    }

    [Fact]
    public void TheStandardVariablesAloneTurnExportOnWithTheirHeadersAndServiceName()
    {
        using var receiver = new OtlpReceiver();
        var requests = Export(
            [],
            new Dictionary<string, string>
            {
                ["OTEL_EXPORTER_OTLP_ENDPOINT"] = "http://127.0.0.1:" + receiver.Port,
                ["OTEL_EXPORTER_OTLP_PROTOCOL"] = "http/protobuf",
                ["OTEL_EXPORTER_OTLP_HEADERS"] = "x-tenant=harrowmere-water",
                ["OTEL_SERVICE_NAME"] = "indexkeeper-depot-7",
                ["OTEL_METRIC_EXPORT_INTERVAL"] = "300",
            },
            receiver);
        Assert.All(requests, r => Assert.Equal("harrowmere-water", r.Headers.GetValueOrDefault("x-tenant")));
        Assert.Contains(requests, r => r.Path == "/v1/metrics" && r.Carries("indexkeeper.pages.embedded") && r.Carries("indexkeeper-depot-7"));
        Assert.Contains(requests, r => r.Path == "/v1/traces" && r.Carries("embed batch"));
    }

    [Fact]
    public async Task MetricsAndTracesGoOutOverGrpcToACollectorService()
    {
        await using var receiver = new OtlpGrpcReceiver();
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "reservoir-levels.pdf"), StorePdfs.Document("Coldwell", 2));
        using var daemon = RunningDaemon.Start(
            temp.Path,
            ["--root", "store", "--encoder", "hashed-terms", "--Daemon:SampleSeconds=0.2", "--Schedule:Windows:0=Mon-Sun 00:00-24:00",
             "--Daemon:OtlpEndpoint=http://127.0.0.1:" + receiver.Port, "--Daemon:OtlpProtocol=grpc"],
            environment: new Dictionary<string, string> { ["OTEL_METRIC_EXPORT_INTERVAL"] = "300", ["OTEL_EXPORTER_OTLP_HEADERS"] = "x-tenant=harrowmere-water" });

        // Parsed by the collector service from the OTLP messages, not searched for in bytes.
        daemon.WaitUntil("metrics and traces arrive over OTLP/gRPC", () =>
            receiver.MetricNames.Contains("indexkeeper.pages.embedded") && receiver.SpanNames.Contains("embed batch"));
        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
        Assert.Contains(new KeyValuePair<string, string>("x-tenant", "harrowmere-water"), receiver.Headers);
    }

    private static List<OtlpRequest> Export(string[] settings, Dictionary<string, string> environment, OtlpReceiver receiver)
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "reservoir-levels.pdf"), StorePdfs.Document("Coldwell", 2));
        using var daemon = RunningDaemon.Start(
            temp.Path, ["--root", "store", "--encoder", "hashed-terms", "--Daemon:SampleSeconds=0.2", "--Schedule:Windows:0=Mon-Sun 00:00-24:00", .. settings], environment: environment);
        daemon.WaitUntil("metrics and traces arrive over OTLP", () =>
            receiver.Requests.Any(r => r.Path == "/v1/metrics" && r.Carries("indexkeeper.pages.embedded")) && receiver.Requests.Any(r => r.Path == "/v1/traces" && r.Carries("embed batch")));
        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
        return receiver.Requests.ToList();
    }
}
