using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Service.Hosting;

/// <summary>
/// An open index for one command or one daemon: the lock, the catalog and the reader, released together.
/// The lock is taken first and released last, so no other process ever sees the catalog open.
/// </summary>
public sealed class IndexSession : IDisposable
{
    private readonly IndexLock indexLock;

    private IndexSession(IndexKeeperOptions options, IndexLock indexLock, IndexCatalog catalog, IDocumentReader reader)
    {
        Options = options;
        this.indexLock = indexLock;
        Catalog = catalog;
        Reader = reader;
    }

    public IndexKeeperOptions Options { get; }

    public IndexCatalog Catalog { get; }

    public IDocumentReader Reader { get; }

    public string IndexDirectory => indexLock.Directory;

    public static IndexSession Open(IndexKeeperOptions options, string purpose)
    {
        ArgumentNullException.ThrowIfNull(options);
        var held = IndexLock.Acquire(options.IndexDirectory, purpose);
        try
        {
            var catalog = IndexCatalog.Open(held);
            return new IndexSession(options, held, catalog, DocumentReaderFactory.Create());
        }
        catch
        {
            held.Dispose();
            throw;
        }
    }

    public ScanSettings ScanSettings() => new(
        Options.Roots.Select(r => new RootSpec(r.Name, Path.GetFullPath(r.Path), r.Include.Count > 0 ? r.Include : RootOptions.SupportedTypes, r.Exclude)).ToList(),
        ReadLimits(),
        TimeSpan.FromSeconds(Options.Detect.SettleSeconds));

    public ReadLimits ReadLimits() => new(
        Options.Limits.MaxFileMegabytes * 1024 * 1024,
        Options.Limits.MaxPages,
        Options.Limits.MaxDecodedStreamMegabytes * 1024 * 1024,
        TimeSpan.FromSeconds(Options.Limits.ReadTimeoutSeconds));

    public void Dispose()
    {
        (Reader as IDisposable)?.Dispose();
        Catalog.Dispose();
        indexLock.Dispose();
    }
}
