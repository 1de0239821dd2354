using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Storage;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Pipeline;

/// <summary>The ground of the pass scenarios: a scratch folder, a catalog under its lock, and the line-per-page stand-in reader.</summary>
public abstract class LinePageScenario : IDisposable
{
    private readonly IndexLock heldLock;

    protected LinePageScenario()
    {
        heldLock = IndexLock.Acquire(Temp.Combine("index"), "test");
        Catalog = IndexCatalog.Open(heldLock);
        Words = PageWordStore.OpenForWriting(Temp.Combine("index"));
    }

    protected TempDirectory Temp { get; } = new();

    protected LinePageReader Reader { get; } = new();

    protected IndexCatalog Catalog { get; }

    protected PageWordStore Words { get; }

    public void Dispose()
    {
        Words.Dispose();
        Catalog.Dispose();
        heldLock.Dispose();
        Temp.Dispose();
        GC.SuppressFinalize(this);
    }
}
