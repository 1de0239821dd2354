using IndexKeeper.Service.Daemon;
using IndexKeeper.Tests.Daemon;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Service;

/// <summary>
/// Logs journald reads well: systemd sets JOURNAL_STREAM when it connects stderr to the journal
/// (systemd.exec(5)), and each line then starts with its syslog priority in angle brackets (sd-daemon(3):
/// "&lt;6&gt;" informational, "&lt;4&gt;" warning, "&lt;3&gt;" error), which journald takes as the entry's level.
/// </summary>
public sealed class LogFormatTests
{
    [Theory]
    [InlineData("auto", null, "text")]
    [InlineData("auto", "", "text")]
    [InlineData("auto", "8:4242", "systemd")]
    [InlineData("text", "8:4242", "text")]
    [InlineData("json", "8:4242", "json")]
    [InlineData("systemd", null, "systemd")]
    public void AutoFollowsTheJournalStreamVariableAndAnExplicitFormatWins(string setting, string? journalStream, string expected) =>
        Assert.Equal(expected, LogFormats.Resolve(setting, journalStream));

    [Fact]
    public void UnderTheJournalEveryLogLineCarriesItsPriority()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "meter-readings.pdf"), StorePdfs.Document("Fernhollow", 1));
        using var daemon = RunningDaemon.Start(
            temp.Path, ["--root", "store", "--encoder", "hashed-terms"], environment: new Dictionary<string, string> { ["JOURNAL_STREAM"] = "8:4242" });
        daemon.WaitUntil("the daemon says it runs", () => daemon.Stderr.Contains("IndexKeeper is running", StringComparison.Ordinal));
        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
        var lines = daemon.Stderr.Split('\n').Where(l => l.Length > 0).ToList();
        Assert.Contains(lines, l => l.StartsWith("<6>", StringComparison.Ordinal) && l.Contains("IndexKeeper is running", StringComparison.Ordinal));

        // Every entry starts with a priority; a message's continuation lines (a stack trace) would not, and there are none here.
        Assert.All(lines, l => Assert.Matches(@"^<[0-7]>", l));
    }
}
