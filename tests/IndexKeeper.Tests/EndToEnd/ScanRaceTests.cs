namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// Issue 2's "file replaced while being read", on a real PDF through the real reader worker: the file is
/// replaced (saved by rename, as editors do) at the instant the worker opens it, after the scan hashed it.
/// The scan must not take the bytes it read for the bytes it hashed: the document is deferred, keeps what
/// the index held, and the next pass takes the new version.
/// </summary>
public sealed class ScanRaceTests : IDisposable
{
    private const string Log = "plant/aeration-log.pdf";
    private readonly CliIndex index = new("plant");

    [OpenGateFact]
    public void A_file_replaced_while_the_worker_reads_it_is_deferred_and_taken_next_pass()
    {
        index.Put(Log, StorePdfs.Document("aeration", 3));
        ContractAssert.Counts(index.Json("scan"), "first scan", ("documentsNew", 1), ("pagesNew", 3));

        var saved = index.Put(Log, StorePdfs.Document("aeration", 3, 2, "Blower two vibration over the alarm limit"));
        var replacement = StorePdfs.ToScratch(index, "replacement.pdf", StorePdfs.Document("aeration", 3, 3, "Diffuser grid three replaced"));
        File.SetLastWriteTimeUtc(replacement, DateTime.UtcNow.AddHours(-1));
        System.Text.Json.JsonElement racing;
        using (var gate = new OpenGate(saved, () => File.Move(replacement, saved, overwrite: true)))
        {
            racing = index.Json("scan");
            Assert.True(gate.Fired, $"the worker's open was not seen ({gate.Opens} opens)");
            Assert.Null(gate.Failure);
        }

        ContractAssert.Counts(
            racing,
            "replaced while read",
            ("documentsSeen", 1),
            ("documentsRead", 1),
            ("documentsDeferred", 1),
            ("documentsChanged", 0),
            ("documentsDeleted", 0),
            ("pagesNew", 0),
            ("pagesRemoved", 0));
        // The index still holds the first version: the replacement differs from it on page 3 only.
        ContractAssert.Counts(
            index.Json("scan"),
            "next pass",
            ("documentsChanged", 1),
            ("documentsDeferred", 0),
            ("documentsRead", 1),
            ("pagesNew", 1),
            ("pagesReused", 2),
            ("pagesRemoved", 1));
    }

    public void Dispose() => index.Dispose();
}
