using System.Diagnostics;
using System.Text.Json;
using System.Text.RegularExpressions;
using IndexKeeper.Tests.Daemon;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Monitoring;

/// <summary>
/// The shipped dashboard and alerting rules against a real daemon: Debian's Prometheus scrapes a running
/// <c>indexkeeper run</c>, loads the rule file, and every dashboard query and every alert expression is
/// evaluated through Prometheus's HTTP API (v1 instant queries), each returning data. A name that drifts in
/// the code, the dashboard or the rules shows up here as a query without data.
/// </summary>
public sealed partial class ShippedMonitoringTests
{
    private static readonly TimeSpan Patience = TimeSpan.FromSeconds(90);

    [PromtoolFact]
    public void EveryDashboardQueryAndAlertExpressionReturnsDataFromARealDaemon()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "pump-station-survey.pdf"), StorePdfs.Document("Brackwater", 3));

        // A file of a type no reader takes, so the per-type figure has a series.
        File.WriteAllText(temp.Combine("store", "valve-layout.dwg"), "not a document any reader takes");
        using var daemon = RunningDaemon.Start(temp.Path, ["--root", "store", "--encoder", "hashed-terms", "--Daemon:SampleSeconds=0.2", "--Schedule:Windows:0=Mon-Sun 00:00-24:00"]);
        daemon.WaitUntil("the pages are embedded", () => daemon.GetJson("/api/status").GetProperty("liveVectorSets").GetInt64() == 3);
        Assert.NotEmpty(daemon.SearchPaths("Brackwater register"));

        using var prometheus = new PrometheusServer(daemon.Client.BaseAddress!, Path.Combine(Promtool.ConfigDirectory, "prometheus", "indexkeeper-alerts.yml"));
        Until("Prometheus is ready", prometheus.Ready, prometheus);

        var queries = DashboardQueries().Select(q => ("dashboard: " + q.Title, q.Expression)).ToList();
        Assert.True(queries.Count >= 20, $"the dashboard has only {queries.Count} queries");
        Until("the rules are loaded", () => prometheus.Rules().Count > 0, prometheus);
        var rules = prometheus.Rules();
        foreach (var (name, query, _, _) in rules)
        {
            queries.Add(("alert: " + name, WithBool(query)));
        }

        // Each query is asked until it returns data (scrapes every second; rates need two samples, the canary
        // check runs once the daemon idles inside its window); within the patience, else the test names it.
        var waiting = queries.ToList();
        var clock = Stopwatch.StartNew();
        var errors = new List<string>();
        while (waiting.Count > 0 && clock.Elapsed < Patience)
        {
            foreach (var query in waiting.ToList())
            {
                var (series, error) = prometheus.Query(query.Item2);
                if (error is not null)
                {
                    errors.Add($"{query.Item1}: {error} ({query.Item2})");
                    waiting.Remove(query);
                }
                else if (series > 0)
                {
                    waiting.Remove(query);
                }
            }

            Thread.Sleep(500);
        }

        Assert.True(errors.Count == 0, "queries Prometheus refused:\n" + string.Join('\n', errors));
        Assert.True(waiting.Count == 0, "queries without data:\n" + string.Join('\n', waiting.Select(q => $"{q.Item1}: {q.Item2}")) + "\n--- daemon ---\n" + daemon.Stderr);

        // Prometheus evaluated every rule itself, without an error.
        Until("every rule is evaluated", () => prometheus.Rules().All(r => r.Health != "unknown"), prometheus);
        Assert.All(prometheus.Rules(), r => Assert.True(r.Health == "ok", $"{r.Name}: {r.Health} {r.Error}"));
        Assert.Equal(8, rules.Count);
        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
    }

    /// <summary>Every panel query of the shipped dashboard, its variables given the values a viewer would have (all daemons, a rate window).</summary>
    private static IReadOnlyList<(string Title, string Expression)> DashboardQueries()
    {
        using var json = JsonDocument.Parse(File.ReadAllText(Path.Combine(Promtool.ConfigDirectory, "dashboards", "indexkeeper.json")));
        var found = new List<(string, string)>();
        Collect(json.RootElement.GetProperty("panels"), found);
        return found;

        static void Collect(JsonElement panels, List<(string, string)> found)
        {
            foreach (var panel in panels.EnumerateArray())
            {
                if (panel.TryGetProperty("panels", out var inner))
                {
                    Collect(inner, found);
                }

                if (panel.TryGetProperty("targets", out var targets))
                {
                    foreach (var target in targets.EnumerateArray())
                    {
                        var expression = target.GetProperty("expr").GetString()!
                            .Replace("$instance", ".*", StringComparison.Ordinal)
                            .Replace("$__rate_interval", "30s", StringComparison.Ordinal);
                        Assert.DoesNotContain("$", expression, StringComparison.Ordinal);
                        found.Add((panel.GetProperty("title").GetString()!, expression));
                    }
                }
            }
        }
    }

    /// <summary>
    /// An alert expression filters: it returns series only while the alert would fire. With PromQL's <c>bool</c>
    /// modifier its comparison returns 0 or 1 for every series instead, so "returns data" shows that the names
    /// and labels it reads exist. Each shipped expression has exactly one comparison, written with spaces around it.
    /// </summary>
    private static string WithBool(string expression)
    {
        var comparisons = Comparison().Matches(expression);
        Assert.True(comparisons.Count == 1, $"expected one comparison in: {expression}");
        return Comparison().Replace(expression, m => " " + m.Groups[1].Value + " bool ");
    }

    private static void Until(string what, Func<bool> condition, PrometheusServer prometheus)
    {
        var clock = Stopwatch.StartNew();
        while (!condition())
        {
            Assert.True(clock.Elapsed < Patience, $"timed out waiting until {what}:\n{string.Join('\n', prometheus.Log)}");
            Thread.Sleep(200);
        }
    }

    [GeneratedRegex(@" (==|!=|>=|<=|>|<) ")]
    private static partial Regex Comparison();
}
