using System.Diagnostics;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Service.Planning;

/// <summary>
/// Times the active encoder on a few real pages (<c>plan --calibrate</c>): pages the index holds, else
/// pages the pending changes would add. Encodes in memory only; nothing is stored.
/// </summary>
internal static class EncoderCalibration
{
    private const int SampleSize = 16;

    public static (double SecondsPerPage, double VectorsPerPage)? Run(
        IndexCatalog catalog, PageWordStore words, IPageEncoder encoder, IReadOnlyDictionary<string, string> rootPaths, IReadOnlyList<PageRecord> pendingPages, CancellationToken cancellationToken)
    {
        var sample = catalog.Pages.ReferencedKeys().Take(SampleSize).Select(catalog.Pages.Find).OfType<PageRecord>()
            .Concat(pendingPages).Take(SampleSize)
            .Select(p => PageInput.From(p, words, rootPaths)).ToList();
        if (sample.Count == 0)
        {
            return null;
        }

        // One untimed page first: model loading and first-call set-up are not throughput.
        encoder.EncodePages(sample.Take(1).ToList(), cancellationToken);
        var stopwatch = Stopwatch.StartNew();
        var vectors = encoder.EncodePages(sample, cancellationToken);
        var seconds = stopwatch.Elapsed.TotalSeconds;
        return (seconds / sample.Count, (double)vectors.Sum(v => v.Count) / sample.Count);
    }
}
