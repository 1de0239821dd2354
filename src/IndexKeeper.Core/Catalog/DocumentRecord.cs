using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Catalog;

/// <summary>One file under a root as the catalog knows it (collection <c>documents</c>).</summary>
public sealed class DocumentRecord
{
    /// <summary>Root name, a NUL, and the relative path: unique, and the lookup key of the quick check.</summary>
    public string Id { get; set; } = string.Empty;

    public string Root { get; set; } = string.Empty;

    public string Path { get; set; } = string.Empty;

    public long Size { get; set; }

    public long ModifiedTicksUtc { get; set; }

    public long Device { get; set; }

    public long FileIndex { get; set; }

    /// <summary>When the stat above was taken (UTC ticks): a stat taken right after a write cannot vouch for the file.</summary>
    public long CheckedAtTicksUtc { get; set; }

    /// <summary>SHA-256 of the file's bytes, lower-case hex (indexed: copies are found by it).</summary>
    public string FileHash { get; set; } = string.Empty;

    public DocumentKind Kind { get; set; }

    public DocumentState State { get; set; }

    /// <summary>Page keys in page order (hex); empty while quarantined.</summary>
    public List<string> PageKeys { get; set; } = [];

    public QuarantineReason? QuarantineReason { get; set; }

    public string? QuarantineMessage { get; set; }

    /// <summary>The <see cref="Documents.ReaderVersion"/> the document was read under; 0 when recorded before the number existed.</summary>
    public int ReaderVersion { get; set; }

    /// <summary>
    /// For a document the office converter drew: its version line then (<see cref="Documents.Office.OfficeConverterIdentity"/>);
    /// null for other kinds and for documents recorded before it was kept.
    /// </summary>
    public string? Converter { get; set; }

    /// <summary>The title the document gives itself (<see cref="DocumentContent.Title"/>), as of its last read; null when none.</summary>
    public string? Title { get; set; }

    public DateTime FirstSeenUtc { get; set; }

    public DateTime LastChangedUtc { get; set; }

    public static string MakeId(string root, string path) => root + "\0" + path;
}
