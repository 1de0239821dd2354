using System.Diagnostics;
using System.Globalization;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Service.Planning;

/// <summary>
/// Times the active encoder on real pages (<c>plan --calibrate</c>, docs/plan.md, "Calibration"): the pages
/// the pending changes would add, else pages the index holds, chosen across document kinds and sizes
/// (<see cref="CalibrationSample"/>). The time of a page is what the embed pass spends on it: its input
/// (words from the page-word store; the page drawn from its file for an encoder that renders) and the
/// encoder, in batches of the embed pass's size. Encodes in memory only; nothing is stored.
/// </summary>
internal static class EncoderCalibration
{
    /// <summary>Index pages looked at to find the kinds present when nothing is pending.</summary>
    private const int IndexSpread = 2048;

    public static CalibrationResult? Run(
        IndexCatalog catalog, PageWordStore words, IPageEncoder encoder, IReadOnlyDictionary<string, string> rootPaths,
        IReadOnlyList<PreviewSampleStratum> pending, int batchSize, CancellationToken cancellationToken)
    {
        var strata = CalibrationSample.Choose(pending.Count > 0 ? pending : IndexStrata(catalog), Size);
        if (strata.Count == 0)
        {
            return null;
        }

        // One untimed page first: model loading and first-call set-up are not throughput.
        encoder.EncodePages([PageInput.From(strata[0].Pages[0], words, rootPaths)], cancellationToken);
        double secondsPerPage = 0, vectorsPerPage = 0;
        var parts = new List<string>();
        foreach (var stratum in strata)
        {
            var stopwatch = Stopwatch.StartNew();
            long vectors = 0;
            // Batched in page-key order, as good as random: the picks are ordered by size, and a batch of alike pages
            // shares more equal-length model runs (TextTokenEncoder) than the run's mixed batches do.
            foreach (var batch in stratum.Pages.OrderBy(p => p.Id, StringComparer.Ordinal).Chunk(Math.Max(1, batchSize)))
            {
                var inputs = batch.Select(p => PageInput.From(p, words, rootPaths)).ToList();
                vectors += encoder.EncodePages(inputs, cancellationToken).Sum(v => (long)v.Count);
            }

            var perPage = stopwatch.Elapsed.TotalSeconds / stratum.Pages.Count;
            secondsPerPage += stratum.Share * perPage;
            vectorsPerPage += stratum.Share * vectors / stratum.Pages.Count;
            parts.Add(string.Create(CultureInfo.InvariantCulture, $"{stratum.Kind} {perPage:0.000} s/page on {stratum.Pages.Count} ({stratum.Share:P0} of the pages)"));
        }

        return new CalibrationResult(secondsPerPage, vectorsPerPage, strata.Sum(s => s.Pages.Count), string.Join(", ", parts));
    }

    /// <summary>A page's size within its kind: its words (those in memory, else the bytes of its stored words).</summary>
    private static long Size(PageRecord page) => page.Words.Count > 0 ? page.Words.Count : page.WordsAt?.Length ?? 0;

    /// <summary>The index's pages by the kind of a document holding them, from keys spread evenly over all of them.</summary>
    private static IReadOnlyList<PreviewSampleStratum> IndexStrata(IndexCatalog catalog)
    {
        var keys = catalog.Pages.ReferencedKeys().ToList();
        var step = Math.Max(1, keys.Count / IndexSpread);
        return keys.Where((_, i) => i % step == 0).Select(catalog.Pages.Find).OfType<PageRecord>()
            .GroupBy(p => catalog.Documents.Find(p.SourceRoot, p.SourcePath)?.Kind.ToString().ToLowerInvariant() ?? "unknown", StringComparer.Ordinal)
            .OrderBy(g => g.Key, StringComparer.Ordinal)
            .Select(g => new PreviewSampleStratum(g.Key, g.Count(), g.Take(PreviewSampleStratum.SampleLimit).ToList()))
            .ToList();
    }
}
