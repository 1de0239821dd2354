using System.Diagnostics;
using System.Net;
using System.Text.Json;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Monitoring;

/// <summary>
/// A real Prometheus (Debian's /usr/bin/prometheus) on a free loopback port with its data in a temp folder,
/// scraping one target every second under the job name the shipped rules expect, with the shipped rules loaded.
/// </summary>
internal sealed class PrometheusServer : IDisposable
{
    private readonly Process process;
    private readonly TempDirectory home = new();
    private readonly HttpClient client;

    public PrometheusServer(Uri target, string ruleFile)
    {
        var port = LoopbackPort.Free();
        var config = home.Write("prometheus.yml", $$"""
            global:
              scrape_interval: 1s
              evaluation_interval: 1s
            rule_files:
              - "{{ruleFile}}"
            scrape_configs:
              - job_name: indexkeeper
                static_configs:
                  - targets: ["{{target.Authority}}"]
            """);
        var start = new ProcessStartInfo(Promtool.ServerPath,
        [
            "--config.file=" + config, "--storage.tsdb.path=" + home.Combine("data"), "--web.listen-address=127.0.0.1:" + port.ToString(System.Globalization.CultureInfo.InvariantCulture),
        ])
        { RedirectStandardOutput = true, RedirectStandardError = true, WorkingDirectory = home.Path };
        process = Process.Start(start)!;
        process.ErrorDataReceived += (_, e) => Log.Enqueue(e.Data ?? string.Empty);
        process.OutputDataReceived += (_, _) => { };
        process.BeginErrorReadLine();
        process.BeginOutputReadLine();
        client = new HttpClient { BaseAddress = new Uri($"http://127.0.0.1:{port}"), Timeout = TimeSpan.FromSeconds(30) };
    }

    public System.Collections.Concurrent.ConcurrentQueue<string> Log { get; } = new();

    /// <summary>Evaluates <paramref name="expression"/> now (instant query, HTTP API v1); the result's series, or the error Prometheus gave.</summary>
    public (int Series, string? Error) Query(string expression)
    {
        using var response = client.GetAsync("/api/v1/query?query=" + Uri.EscapeDataString(expression)).GetAwaiter().GetResult();
        using var json = JsonDocument.Parse(response.Content.ReadAsStringAsync().GetAwaiter().GetResult());
        var root = json.RootElement;
        if (root.GetProperty("status").GetString() != "success")
        {
            return (0, root.GetProperty("error").GetString());
        }

        var result = root.GetProperty("data").GetProperty("result");
        return (result.ValueKind == JsonValueKind.Array ? result.GetArrayLength() : 1, null);
    }

    /// <summary>The loaded rules as Prometheus parsed and evaluates them: name, expression, health ("ok", "err", "unknown") and last error.</summary>
    public IReadOnlyList<(string Name, string Query, string Health, string? Error)> Rules()
    {
        using var json = JsonDocument.Parse(client.GetStringAsync("/api/v1/rules").GetAwaiter().GetResult());
        return json.RootElement.GetProperty("data").GetProperty("groups").EnumerateArray()
            .SelectMany(g => g.GetProperty("rules").EnumerateArray())
            .Select(r => (r.GetProperty("name").GetString()!, r.GetProperty("query").GetString()!, r.GetProperty("health").GetString()!, r.TryGetProperty("lastError", out var e) ? e.GetString() : null))
            .ToList();
    }

    public bool Ready()
    {
        if (process.HasExited)
        {
            throw new InvalidOperationException($"prometheus exited {process.ExitCode}:\n{string.Join('\n', Log)}");
        }

        try
        {
            using var response = client.GetAsync("/-/ready").GetAwaiter().GetResult();
            return response.StatusCode == HttpStatusCode.OK;
        }
        catch (HttpRequestException)
        {
            return false;
        }
    }

    public void Dispose()
    {
        client.Dispose();
        if (!process.HasExited)
        {
            process.Kill(entireProcessTree: true);
            process.WaitForExit();
        }

        process.Dispose();
        home.Dispose();
    }
}
