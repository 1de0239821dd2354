using System.Text.Json;
using SixLabors.ImageSharp;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// The end-to-end job of issue 3 on the real executable: sync a store, then edit one page of a 50-page
/// PDF and re-save it with qpdf, copy another PDF into a second folder and delete a third; the second sync
/// costs one encoder call, the deleted pages' vector sets turn dead, compaction reclaims them, verify is
/// clean, and a search for a phrase that only the edited page shows finds that page first, with a match
/// map per hit.
/// </summary>
public sealed class SyncJobTests : IDisposable
{
    private const int ManualPages = 50;
    private const int EditedPage = 17;
    private const int ReportPages = 6;
    private const int SurveyPages = 5;
    private const string EditedLine = "Sluice gate seven corroded beneath the eastern walkway";

    private readonly CliIndex index = new("store");

    [Fact]
    public void One_edited_page_a_copy_and_a_deletion_cost_one_encoder_call_dead_vectors_are_compacted_and_the_edit_is_found()
    {
        index.Put("store/manuals/intake-manual.pdf", StorePdfs.Document("intake", ManualPages));
        index.Put("store/reports/filter-report.pdf", StorePdfs.Document("filter", ReportPages));
        index.Put("store/reports/old-survey.pdf", StorePdfs.Document("survey", SurveyPages));
        const int allPages = ManualPages + ReportPages + SurveyPages;

        var first = index.Json("sync");
        ContractAssert.Counts(first, "first sync", ("documentsNew", 3), ("pagesNew", allPages), ("pagesEmbedded", allPages), ("pagesFailed", 0));

        // The edit: PdfPig's builder writes the manual again with page 17 changed, then Debian's qpdf
        // re-saves it (plain rewrite: new object layout, the same pages), as a user's tool chain would.
        var edited = StorePdfs.ToScratch(index, "edited.pdf", StorePdfs.Document("intake", ManualPages, EditedPage, EditedLine));
        index.Put("store/manuals/intake-manual.pdf", StorePdfs.Qpdf(index, "rewritten.pdf", edited));
        index.Put("store/archive/filter-report.pdf", index.Get("store/reports/filter-report.pdf"));
        index.Delete("store/reports/old-survey.pdf");

        var second = index.Json("sync");
        ContractAssert.Counts(
            second,
            "second sync",
            ("documentsSeen", 3),
            ("documentsNew", 1),
            ("documentsChanged", 1),
            ("documentsUnchanged", 1),
            ("documentsDeleted", 1),
            ("documentsCopied", 1),
            ("documentsRead", 1), // only the edited manual is parsed; the copy's pages come from the catalog
            ("pagesNew", 1), // the copy adds no page key: 0 of the new keys are its
            ("pagesReused", ManualPages - 1 + ReportPages),
            ("pagesRemoved", SurveyPages + 1), // the survey's pages and the old version of page 17
            ("pagesEmbedded", 1));

        // All pages had live vector sets after the first sync; the survey's and the old page 17's die.
        var after = index.Json("status");
        ContractAssert.Counts(
            after,
            "status after the second sync",
            ("documents", 3),
            ("liveVectorSets", allPages - SurveyPages),
            ("vectorSets", allPages + 1),
            ("queued", 0));

        // Every page carries about the same words, so its vector set about the same bytes: 6 dead sets of
        // 62 are near a tenth of the segment bytes.
        var deadRatio = after.GetProperty("deadRatio").GetDouble();
        Assert.InRange(deadRatio, 0.05, 0.15);

        // Compaction in a later process than the syncs that wrote the segment must still take it; the
        // threshold is lowered under this store's dead share (the default is 0.2).
        var compaction = index.Json("compact", "--Storage:CompactDeadShare=0.05");
        Assert.True(ContractAssert.Long(compaction, "jobs") >= 1 && ContractAssert.Long(compaction, "bytesReclaimed") > 0, compaction.ToString());

        var verify = index.Json("verify");
        Assert.True(verify.GetProperty("clean").GetBoolean(), verify.ToString());

        var maps = index.PathOf("maps");
        var search = index.Json("search", "sluice gate corroded eastern walkway", "-k", "5", "--maps", maps);
        var hits = search.GetProperty("hits").EnumerateArray().ToList();
        Assert.NotEmpty(hits);
        Assert.Equal(("store", "manuals/intake-manual.pdf", EditedPage), (hits[0].GetProperty("root").GetString(), hits[0].GetProperty("path").GetString(), hits[0].GetProperty("page").GetInt32()));
        Assert.True(hits.Skip(1).All(h => h.GetProperty("score").GetDouble() < hits[0].GetProperty("score").GetDouble()), search.ToString());
        AssertOneMatchMapPerHit(maps, hits);

        var compacted = index.Json("status");
        ContractAssert.Counts(compacted, "status after compaction", ("liveVectorSets", allPages - SurveyPages), ("vectorSets", allPages - SurveyPages));
        Assert.InRange(compacted.GetProperty("deadRatio").GetDouble(), 0, 0.01);
    }

    public void Dispose() => index.Dispose();

    private static void AssertOneMatchMapPerHit(string maps, List<JsonElement> hits)
    {
        var files = Directory.GetFiles(maps, "*.png");
        Assert.Equal(hits.Count, files.Length);
        foreach (var file in files)
        {
            var bytes = File.ReadAllBytes(file);

            // PNG signature, ISO/IEC 15948 section 5.2 (RFC 2083 section 3.1), then the IHDR chunk first
            // with its 13-byte data length (section 11.2.2).
            Assert.Equal(new byte[] { 0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A }, bytes[..8]);
            Assert.Equal(new byte[] { 0, 0, 0, 13, (byte)'I', (byte)'H', (byte)'D', (byte)'R' }, bytes[8..16]);

            // Decoded by an independent library from the registry (ImageSharp).
            var info = Image.Identify(bytes);
            Assert.True(info.Width > 0 && info.Height > 0, file);
        }
    }
}
