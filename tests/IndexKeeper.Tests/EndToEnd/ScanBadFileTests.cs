using System.Text.Json;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// Issue 2's scenarios of bad files, on real files through the real reader worker (<c>scan --json</c>,
/// <c>status --json</c>): a corrupted PDF, an encrypted one and a zero-byte file are quarantined with their
/// reasons and retried only when they change; links out of the root are never followed.
/// </summary>
public sealed class ScanBadFileTests : IDisposable
{
    private readonly CliIndex index = new("inbox");

    [Fact]
    public void Bad_files_are_quarantined_with_reasons_links_out_of_the_root_are_skipped_and_a_repaired_file_is_read()
    {
        index.Put("inbox/good.pdf", StorePdfs.Document("meter-readings", 3));
        index.Put("inbox/damaged.pdf", BadPdfs.Damaged(StorePdfs.Document("damaged", 3)));
        var plain = StorePdfs.ToScratch(index, "plain.pdf", StorePdfs.Document("confidential", 2));
        index.Put("inbox/encrypted.pdf", StorePdfs.Qpdf(index, "encrypted.pdf", "--encrypt", "inspector", "owner", "256", "--", plain));
        index.Put("inbox/empty.pdf", []);

        // A good PDF outside the root, reachable only through links inside it.
        var secret = index.Put("outside/secret.pdf", StorePdfs.Document("secret", 2));
        File.CreateSymbolicLink(index.PathOf("inbox/link-out.pdf"), secret);
        Directory.CreateSymbolicLink(index.PathOf("inbox/outside-folder"), Path.GetDirectoryName(secret)!);

        var first = index.JsonExpecting(1, "scan");
        ContractAssert.Counts(
            first,
            "a good file, bad files and links",
            ("documentsSeen", 4),
            ("documentsNew", 4),
            ("documentsQuarantined", 3),
            ("documentsRead", 4),
            ("pagesNew", 3),
            ("pagesSeen", 3));
        var problems = first.GetProperty("problems").EnumerateArray().Select(p => p.GetString()!).ToList();
        Assert.Contains(problems, p => p.StartsWith("inbox/link-out.pdf: LinkOutsideRoot", StringComparison.Ordinal));
        Assert.Contains(problems, p => p.StartsWith("inbox/outside-folder: LinkToFolder", StringComparison.Ordinal));

        var status = index.Json("status");
        // The empty file is named as a PDF: a damaged copy, so a fault like the others (docs/readers.md).
        ContractAssert.Counts(status, "status with three quarantined", ("documents", 1), ("quarantined", 3), ("pages", 3));
        Assert.Equal(0, status.GetProperty("files").GetProperty("selectedButUnsupported").GetInt64());
        Assert.Equal(
            [("damaged.pdf", "Corrupt"), ("empty.pdf", "Unsupported"), ("encrypted.pdf", "Encrypted")],
            Quarantine(status).Select(q => (q.Path, q.Reason)).ToList());

        // Repaired: the damaged file is replaced by a good one and read; the unchanged bad files are not retried.
        index.Put("inbox/damaged.pdf", StorePdfs.Document("repaired", 2));
        ContractAssert.Counts(
            index.Json("scan"),
            "repaired file",
            ("documentsChanged", 1),
            ("documentsUnchanged", 3),
            ("documentsQuarantined", 0),
            ("documentsRead", 1),
            ("pagesNew", 2));
    }

    public void Dispose() => index.Dispose();

    /// <summary>The quarantine entries of <c>status --json</c>, sorted by path; each must say why.</summary>
    internal static List<(string Path, string Reason)> Quarantine(JsonElement status)
    {
        var entries = status.GetProperty("quarantine").EnumerateArray().ToList();
        Assert.All(entries, e => Assert.False(string.IsNullOrWhiteSpace(e.GetProperty("message").GetString()), e.ToString()));
        return entries.Select(e => (e.GetProperty("path").GetString()!, e.GetProperty("reason").GetString()!)).OrderBy(e => e.Item1, StringComparer.Ordinal).ToList();
    }
}
