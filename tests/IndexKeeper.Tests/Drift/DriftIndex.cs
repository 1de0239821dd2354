using System.Security.Cryptography;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Queue;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Drift;

/// <summary>
/// An index opened in-process as a command opens it (<see cref="IndexComposition"/>), with pages put straight into
/// the catalog as a scan would (one document per call, invented words of our demo scenario) and embedded by the
/// real embed batch. Each <see cref="Open"/> configures the hashed-term encoder with a given d: two values of d
/// are two encoder ids, so switching is a declared change.
/// </summary>
internal sealed class DriftIndex : IDisposable
{
    private readonly TempDirectory temp = new();

    public string IndexDirectory => temp.Combine("index");

    public IndexComposition Open(int dimensions = 128) => IndexComposition.Open(
        new IndexKeeperOptions
        {
            IndexDirectory = IndexDirectory,
            Roots = [new RootOptions { Name = "store", Path = Directory.CreateDirectory(temp.Combine("store")).FullName }],
            Encoder = new EncoderOptions { Name = "hashed-terms", Dimensions = dimensions },
        },
        "drift test");

    /// <summary>Page key of a page showing <paramref name="text"/> (invented: a hash of the text).</summary>
    public static string KeyOf(string text) => PageKey.FromHash(SHA256.HashData(System.Text.Encoding.UTF8.GetBytes(text))).Hex;

    /// <summary>Adds a live document whose pages show the given texts, and queues the new page keys (fresh).</summary>
    public static void AddDocument(IndexCatalog catalog, string path, params string[] pages)
    {
        var now = DateTime.UtcNow;
        var edit = new CatalogEdit();
        edit.PutDocuments.Add(new DocumentRecord
        {
            Id = DocumentRecord.MakeId("store", path),
            Root = "store",
            Path = path,
            Kind = DocumentKind.Pdf,
            State = DocumentState.Live,
            PageKeys = [.. pages.Select(KeyOf)],
            FirstSeenUtc = now,
            LastChangedUtc = now,
        });
        foreach (var text in pages)
        {
            edit.AddPages.Add(new PageRecord
            {
                Id = KeyOf(text),
                References = 1,
                Width = 612,
                Height = 792,
                Words = [.. text.Split(' ').Select((w, i) => new WordRecord { T = w, L = 72 + (i * 40), B = 700, R = 72 + (i * 40) + 36, U = 712 })],
                SourceRoot = "store",
                SourcePath = path,
                SourcePage = 1,
                FirstSeenUtc = now,
            });
            edit.Enqueue.Add(new QueueRecord { Id = KeyOf(text), Priority = QueuePriority.Fresh, EnqueuedUtc = now, NotBeforeUtc = now });
        }

        catalog.Apply(edit);
    }

    public static ScanSummary Embed(IndexComposition session)
    {
        var summary = new ScanSummary();
        session.Get<EmbedBatchOperation>().RunAll(summary, null, CancellationToken.None);
        return summary;
    }

    public void Dispose() => temp.Dispose();
}
