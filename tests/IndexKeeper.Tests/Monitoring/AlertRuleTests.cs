namespace IndexKeeper.Tests.Monitoring;

/// <summary>
/// The shipped alerting rules (config/prometheus) checked by Debian's promtool, the reference checker of the
/// Prometheus rule file format: the file is valid, and its unit tests (series in, alerts out) pass.
/// </summary>
public sealed class AlertRuleTests
{
    private static readonly string Folder = Path.Combine(Promtool.ConfigDirectory, "prometheus");

    [PromtoolFact]
    public void TheRuleFilePassesPromtoolCheckRules()
    {
        var (exit, output) = Promtool.Run(Folder, "check", "rules", "indexkeeper-alerts.yml");
        Assert.True(exit == 0, "promtool check rules:\n" + output);
        Assert.Contains("SUCCESS", output, StringComparison.Ordinal);
    }

    [PromtoolFact]
    public void TheRuleUnitTestsPass()
    {
        var (exit, output) = Promtool.Run(Folder, "test", "rules", "indexkeeper-alerts.test.yml");
        Assert.True(exit == 0, "promtool test rules:\n" + output);
    }

    /// <summary>Each alert has at least one unit test that expects it to fire, so no rule ships untested.</summary>
    [Fact]
    public void EveryAlertIsExpectedToFireInSomeUnitTest()
    {
        var rules = File.ReadAllLines(Path.Combine(Folder, "indexkeeper-alerts.yml"))
            .Select(l => l.Trim()).Where(l => l.StartsWith("- alert: ", StringComparison.Ordinal)).Select(l => l["- alert: ".Length..]).ToList();
        var tests = File.ReadAllText(Path.Combine(Folder, "indexkeeper-alerts.test.yml"));
        Assert.NotEmpty(rules);
        foreach (var alert in rules)
        {
            Assert.Contains("alertname: " + alert + "\n        exp_alerts:\n          - exp_labels:", tests, StringComparison.Ordinal);
        }
    }
}
