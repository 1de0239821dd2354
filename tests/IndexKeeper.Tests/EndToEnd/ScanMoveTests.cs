namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// Issue 2's scenarios of whole files, on real PDFs through the real reader worker (<c>scan --json</c>):
/// a copy, a rename and a move to another root take their page keys from the catalog without a parse, and
/// a deletion removes only the page keys no other document holds.
/// </summary>
public sealed class ScanMoveTests : IDisposable
{
    private readonly CliIndex index = new("left", "right");

    [Fact]
    public void Copy_rename_move_across_roots_and_delete_cost_no_read_and_no_new_page()
    {
        index.Put("left/manuals/pumps.pdf", StorePdfs.Document("pumps", 4));
        index.Put("left/manuals/valves.pdf", StorePdfs.Document("valves", 3));
        index.Put("left/reports/spare-parts.pdf", StorePdfs.Document("spares", 2));
        ContractAssert.Counts(index.Json("scan"), "first scan", ("documentsSeen", 3), ("documentsNew", 3), ("pagesNew", 9), ("pagesReused", 0), ("pagesEmbedded", 0));

        index.Put("left/archive/pumps-copy.pdf", index.Get("left/manuals/pumps.pdf"));
        ContractAssert.Counts(
            index.Json("scan"),
            "copy into another folder",
            ("documentsSeen", 4),
            ("documentsNew", 1),
            ("documentsUnchanged", 3),
            ("documentsCopied", 1),
            ("documentsRead", 0),
            ("pagesNew", 0),
            ("pagesReused", 4),
            ("pagesRemoved", 0));

        index.Move("left/manuals/valves.pdf", "left/manuals/valves-2026.pdf");
        AssertMovedWithoutRead("rename", pagesReused: 3);

        index.Move("left/reports/spare-parts.pdf", "right/spare-parts.pdf");
        AssertMovedWithoutRead("move to the other root", pagesReused: 2);

        // The copy's pages stay held by the original; the renamed file was the only holder of its pages.
        index.Delete("left/archive/pumps-copy.pdf");
        index.Delete("left/manuals/valves-2026.pdf");
        ContractAssert.Counts(
            index.Json("scan"),
            "delete a copy and a sole holder",
            ("documentsSeen", 2),
            ("documentsNew", 0),
            ("documentsUnchanged", 2),
            ("documentsDeleted", 2),
            ("pagesNew", 0),
            ("pagesRemoved", 3));
    }

    /// <summary>A moved document (seen once as deleted plus new) costs no read and no new page key.</summary>
    private void AssertMovedWithoutRead(string step, int pagesReused) =>
        ContractAssert.Counts(
            index.Json("scan"),
            step,
            ("documentsSeen", 4),
            ("documentsNew", 1),
            ("documentsDeleted", 1),
            ("documentsMoved", 1),
            ("documentsRead", 0),
            ("pagesNew", 0),
            ("pagesReused", pagesReused),
            ("pagesRemoved", 0));

    public void Dispose() => index.Dispose();
}
