using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;

namespace IndexKeeper.Service.Hosting;

/// <summary>
/// What the roots hold by type, so nothing is skipped silently: documents indexed by kind (now), documents
/// quarantined, and what the last full pass walked past (skipped by the root's globs, or of a type no reader takes).
/// </summary>
public sealed class FileTally
{
    /// <summary>Live documents by kind (Pdf, Image, OfficeOpenXml, …).</summary>
    public IReadOnlyDictionary<string, long> IndexedByKind { get; init; } = new Dictionary<string, long>();

    /// <summary>Quarantined documents that count towards health (unreadable, damaged, too large, timed out, …).</summary>
    public long Quarantined { get; init; }

    /// <summary>Documents an include glob selected whose bytes no reader takes: listed in the quarantine, not a fault.</summary>
    public long SelectedButUnsupported { get; init; }

    /// <summary>Files of a readable type that the include or exclude globs left out (last full pass).</summary>
    public long SkippedByPattern { get; init; }

    /// <summary>Files of a type no reader takes, walked past (last full pass).</summary>
    public long Unsupported { get; init; }

    /// <summary>The unsupported files by type (lower-case extension, or "(none)"), most first (last full pass).</summary>
    public IReadOnlyList<TypeCount> UnsupportedTypes { get; init; } = [];

    /// <param name="liveByKind">Live documents by kind (the running counts' <see cref="RunningCounts.LiveByKind"/>).</param>
    public static FileTally Of(IndexCatalog catalog, CatalogFigures figures, IReadOnlyDictionary<DocumentKind, long> liveByKind)
    {
        ArgumentNullException.ThrowIfNull(liveByKind);
        ArgumentNullException.ThrowIfNull(catalog);
        ArgumentNullException.ThrowIfNull(figures);
        var last = catalog.History.LastScan();
        return new FileTally
        {
            IndexedByKind = liveByKind.OrderBy(k => k.Key).ToDictionary(k => k.Key.ToString(), k => k.Value, StringComparer.Ordinal),
            Quarantined = figures.QuarantinedDocuments,
            SelectedButUnsupported = figures.UnsupportedDocuments,
            SkippedByPattern = last?.Counts.GetValueOrDefault(ScanRecord.FilesSkippedByPatternKey) ?? 0,
            Unsupported = last?.Counts.GetValueOrDefault(ScanRecord.FilesUnsupportedKey) ?? 0,
            UnsupportedTypes = last?.UnsupportedTypes.OrderByDescending(t => t.Files).ThenBy(t => t.Type, StringComparer.Ordinal).ToList() ?? [],
        };
    }
}
