using System.Diagnostics;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Monitoring;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Daemon;

/// <summary>
/// <c>/metrics</c> checked by Debian's <c>promtool check metrics</c> (package prometheus), the reference
/// parser and linter of the Prometheus text exposition format.
/// </summary>
public sealed class MetricsExpositionTests
{
    [PromtoolFact]
    public void ScrapeOutputPassesPromtoolAndCarriesTheInstruments()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "tide-tables.pdf"), StorePdfs.Document("Saltmarsh", 3));
        using var daemon = RunningDaemon.Start(temp.Path, ["--root", "store", "--encoder", "hashed-terms", "--Daemon:SampleSeconds=0.2", "--Schedule:Windows:0=Mon-Sun 00:00-24:00"]);
        daemon.WaitUntil("the pages are embedded", () => daemon.GetJson("/api/status").GetProperty("liveVectorSets").GetInt64() == 3);
        string metrics = string.Empty;
        daemon.WaitUntil("the figures are sampled", () =>
        {
            metrics = daemon.GetText("/metrics");
            return metrics.Contains("indexkeeper_documents{otel_scope_name=\"IndexKeeper\",state=\"live\"} 1", StringComparison.Ordinal);
        });

        var start = new ProcessStartInfo(Promtool.Path, ["check", "metrics"]) { RedirectStandardInput = true, RedirectStandardOutput = true, RedirectStandardError = true };
        using var promtool = Process.Start(start)!;
        promtool.StandardInput.Write(metrics);
        promtool.StandardInput.Close();
        var output = promtool.StandardOutput.ReadToEnd() + promtool.StandardError.ReadToEnd();
        promtool.WaitForExit();
        Assert.True(promtool.ExitCode == 0, "promtool check metrics:\n" + output + "\n--- exposition ---\n" + metrics);

        // Names our dashboards rely on; histograms in seconds with bounds that fit seconds.
        foreach (var name in new[]
        {
            "indexkeeper_documents", "indexkeeper_pages", "indexkeeper_queue_depth", "indexkeeper_pages_embedded_total",
            "indexkeeper_encoder_duration_seconds_bucket", "indexkeeper_embed_rate_per_second", "indexkeeper_scan_duration_seconds_bucket",
            "indexkeeper_document_read_duration_seconds_bucket",
            "indexkeeper_full_walk_age_seconds", "indexkeeper_watcher_overflows_total", "indexkeeper_quarantine", "indexkeeper_segments",
            "indexkeeper_dead_ratio", "indexkeeper_disk_usage_bytes", "indexkeeper_pages_drifted", "indexkeeper_window_open", "indexkeeper_files_passed_over",
            "indexkeeper_health", "indexkeeper_health_reason", "indexkeeper_migration_progress", "indexkeeper_migration_time_left_seconds",
            "indexkeeper_pages_without_vectors", "indexkeeper_search_requests_total", "indexkeeper_root_documents", "indexkeeper_root_pages",
            "indexkeeper_root_size_bytes", "indexkeeper_root_present",
        })
        {
            Assert.Contains("\n" + name + "{", "\n" + metrics, StringComparison.Ordinal);
        }

        Assert.Contains("indexkeeper_encoder_duration_seconds_bucket{otel_scope_name=\"IndexKeeper\",le=\"0.005\"}", metrics, StringComparison.Ordinal);
        Assert.Contains("indexkeeper_pages_embedded_total{otel_scope_name=\"IndexKeeper\"} 3", metrics, StringComparison.Ordinal);
        // One PDF read once: its reading time is counted under its kind.
        Assert.Contains("indexkeeper_document_read_duration_seconds_count{otel_scope_name=\"IndexKeeper\",kind=\"pdf\"} 1", metrics, StringComparison.Ordinal);

        // One series per health code whether or not it holds, and per root; every page has vectors.
        Assert.Contains("indexkeeper_health_reason{otel_scope_name=\"IndexKeeper\",code=\"root-missing\"} 0", metrics, StringComparison.Ordinal);
        Assert.Contains("indexkeeper_root_pages{otel_scope_name=\"IndexKeeper\",root=\"store\"} 3", metrics, StringComparison.Ordinal);
        Assert.Contains("indexkeeper_pages_without_vectors{otel_scope_name=\"IndexKeeper\"} 0", metrics, StringComparison.Ordinal);
        Assert.Contains("indexkeeper_search_requests_total{otel_scope_name=\"IndexKeeper\",outcome=\"failed\"} 0", metrics, StringComparison.Ordinal);
        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
    }
}
