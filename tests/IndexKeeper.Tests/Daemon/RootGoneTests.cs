using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Daemon;

/// <summary>A root that vanishes (an unmounted share) is reported and its documents kept until its grace time ends; when it comes back it is walked again.</summary>
public sealed class RootGoneTests
{
    [Fact]
    public void AVanishedRootIsReportedKeptForItsGraceTimeThenForgottenAndWalkedWhenBack()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("share"));
        File.WriteAllBytes(temp.Combine("share", "minutes.pdf"), StorePdfs.Document("Larkspur", 1));

        // 0.005 h = 18 s of grace.
        using var daemon = RunningDaemon.Start(temp.Path, ["--root", "share", "--encoder", "hashed-terms", "--Detect:RootGoneGraceHours=0.005", "--Schedule:Windows:0=Mon-Sun 00:00-24:00"]);
        daemon.WaitUntil("the document is indexed", () => daemon.GetJson("/api/status").GetProperty("documents").GetInt64() == 1);

        Directory.Move(temp.Combine("share"), temp.Combine("share-unmounted"));
        daemon.WaitUntil("health reports the root missing", () => daemon.GetText("/health").Contains("root-missing", StringComparison.Ordinal));
        Assert.Equal(1, daemon.GetJson("/api/status").GetProperty("documents").GetInt64());

        daemon.WaitUntil("the grace time is over and the documents are removed", () => daemon.GetJson("/api/status").GetProperty("documents").GetInt64() == 0);

        Directory.Move(temp.Combine("share-unmounted"), temp.Combine("share"));
        daemon.WaitUntil("the root is walked again when it is back", () =>
            daemon.GetJson("/api/status").GetProperty("documents").GetInt64() == 1 && !daemon.GetText("/health").Contains("root-missing", StringComparison.Ordinal));
        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
    }
}
