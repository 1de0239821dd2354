using IndexKeeper.Core.Catalog;

namespace IndexKeeper.Service.Hosting;

/// <summary>The figures of an index, as <c>status --json</c> prints them and the API serves them.</summary>
public sealed class StatusReport
{
    public string IndexDirectory { get; init; } = string.Empty;

    public long Documents { get; init; }

    /// <summary>Distinct page keys held by live documents.</summary>
    public long Pages { get; init; }

    /// <summary>Page positions in live documents (a page key held by two copies counts twice).</summary>
    public long PageLocations { get; init; }

    public long Queued { get; init; }

    public long Quarantined { get; init; }

    public long BytesOnDisk { get; init; }

    public DateTime? LastScanUtc { get; init; }

    public IReadOnlyList<string> Roots { get; init; } = [];

    public IReadOnlyList<QuarantineEntry> Quarantine { get; init; } = [];

    public static StatusReport Build(IndexSession session)
    {
        ArgumentNullException.ThrowIfNull(session);
        var figures = session.Catalog.Figures();
        return new StatusReport
        {
            IndexDirectory = session.IndexDirectory,
            Documents = figures.Documents,
            Pages = figures.Pages,
            PageLocations = figures.PageLocations,
            Queued = figures.Queued,
            Quarantined = figures.QuarantinedDocuments,
            BytesOnDisk = new DirectoryInfo(session.IndexDirectory).EnumerateFiles("*", SearchOption.AllDirectories).Sum(f => f.Length),
            LastScanUtc = figures.LastScanUtc,
            Roots = session.Options.Roots.Select(r => r.Name).ToList(),
            Quarantine = session.Catalog.QuarantinedDocuments()
                .Select(d => new QuarantineEntry(d.Root, d.Path, d.QuarantineReason?.ToString() ?? "Unknown", d.QuarantineMessage ?? string.Empty, d.LastChangedUtc.ToUniversalTime()))
                .ToList(),
        };
    }
}
