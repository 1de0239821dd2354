using IndexKeeper.Tests.Isolation;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// Issue 2's hostile set in one root beside good PDFs, through the real executable and its reader worker:
/// the pass finishes, every good file is indexed (its pages have live vector sets), and each hostile file is quarantined with
/// its reason in <c>status --json</c>.
/// </summary>
public sealed class HostileSetTests : IDisposable
{
    private readonly CliIndex index = new("incoming");

    [Fact]
    public void Hostile_files_are_quarantined_with_reasons_and_every_good_file_beside_them_is_indexed()
    {
        index.Put("incoming/a-pump-log.pdf", StorePdfs.Document("pump-log", 3));
        index.Put("incoming/m-flow-survey.pdf", StorePdfs.Document("flow-survey", 2));
        index.Put("incoming/z-reservoir-notes.pdf", StorePdfs.Document("reservoir-notes", 4));
        const int goodPages = 3 + 2 + 4;

        // Built from ISO 32000-1 structures by Isolation.HostileFiles; the bomb inflates to 32 MiB against a 1 MiB cap.
        index.Put("incoming/cyclic-forms.pdf", HostileFiles.FormsThatDrawEachOther());
        index.Put("incoming/inflation-bomb.pdf", BadPdfs.InflationBomb(32));
        index.Put("incoming/nested-arrays.pdf", HostileFiles.DeeplyNestedArrays());
        index.Put("incoming/random-bytes.pdf", HostileFiles.Random());
        var plain = StorePdfs.ToScratch(index, "plain.pdf", GoodFiles.InspectionPdf());
        index.Put("incoming/encrypted.pdf", StorePdfs.Qpdf(index, "encrypted.pdf", "--encrypt", "inspector", "owner", "256", "--", plain));

        var sync = index.JsonExpecting(1, "sync", "--Limits:MaxDecodedStreamMegabytes=1");
        ContractAssert.Counts(
            sync,
            "sync of the hostile set",
            ("documentsSeen", 8),
            ("documentsNew", 8),
            ("documentsQuarantined", 5),
            ("pagesNew", goodPages),
            ("pagesEmbedded", goodPages),
            ("pagesFailed", 0));

        var status = index.Json("status");
        ContractAssert.Counts(status, "status", ("documents", 3), ("quarantined", 5), ("liveVectorSets", goodPages), ("queued", 0));

        // The cycle is found before it is followed, the nesting stops at the parser's depth limit, random
        // bytes carry no known signature (the reasons Isolation.HostileFileTests expects of the reader).
        Assert.Equal(
            [
                ("cyclic-forms.pdf", "Corrupt"),
                ("encrypted.pdf", "Encrypted"),
                ("inflation-bomb.pdf", "DecodedStreamTooLarge"),
                ("nested-arrays.pdf", "Corrupt"),
                ("random-bytes.pdf", "Unsupported"),
            ],
            ScanBadFileTests.Quarantine(status));
    }

    public void Dispose() => index.Dispose();
}
