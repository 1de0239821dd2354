namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// README's exit-code contract for a pass: a file quarantined or unreadable in this pass is a partial
/// failure (exit 1) with its count in the output, not a silent exit 0; the next pass without new trouble exits 0.
/// </summary>
public sealed class SyncExitCodeTests : IDisposable
{
    private readonly CliIndex index = new("inbox") { ShippedEncoder = false };

    [Fact]
    public void A_sync_that_quarantines_a_file_exits_1_and_counts_it()
    {
        index.Put("inbox/good.pdf", StorePdfs.Document("sluice-gates", 2));
        index.Put("inbox/damaged.pdf", BadPdfs.Damaged(StorePdfs.Document("damaged", 2)));

        var first = index.Run("sync");
        Assert.True(first.ExitCode == 1, first.Stdout + first.Stderr);
        Assert.Contains("unreadable 1 file(s) in this pass: 1 quarantined", first.Stdout, StringComparison.Ordinal);

        // The quarantined file is not read again until it changes: a pass with no new trouble exits 0.
        var json = index.Json("sync");
        Assert.Equal(0, json.GetProperty("documentsQuarantined").GetInt64());
        Assert.Equal(0, json.GetProperty("filesUnreadable").GetInt64());

        index.Put("inbox/damaged.pdf", BadPdfs.Damaged(StorePdfs.Document("damaged again", 2)));
        var again = index.JsonExpecting(1, "sync");
        Assert.Equal(1, again.GetProperty("documentsQuarantined").GetInt64());
    }

    public void Dispose() => index.Dispose();
}
