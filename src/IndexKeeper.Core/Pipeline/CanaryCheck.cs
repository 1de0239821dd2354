using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Drift;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Pipeline;

/// <summary>
/// Silent drift (docs/encoders.md, "Canaries"): re-embeds the canary pages with the active encoder and
/// compares the result with the vectors stored under the same encoder id. Same id, different numbers
/// (a runtime upgrade that changed arithmetic, a damaged model file) means the id no longer tells the
/// truth; the figures are recorded on the encoder's catalog record either way. The daemon calls this on
/// its schedule; <c>encoders --check-canaries</c> calls it now.
/// </summary>
/// <remarks>REQUIRES: the index lock is held (the store is read while the writer is idle).</remarks>
public static class CanaryCheck
{
    public static CanaryFigures Run(
        IndexCatalog catalog,
        VectorStore store,
        PageWordStore words,
        IPageEncoder encoder,
        IReadOnlyDictionary<string, string> rootPaths,
        CanarySettings settings,
        DateTime nowUtc,
        CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        ArgumentNullException.ThrowIfNull(store);
        ArgumentNullException.ThrowIfNull(words);
        ArgumentNullException.ThrowIfNull(encoder);
        ArgumentNullException.ThrowIfNull(rootPaths);
        ArgumentNullException.ThrowIfNull(settings);
        var encoderId = encoder.Identity.Id;
        var records = new List<VectorSetRecord>();
        var pages = new List<PageToEncode>();
        foreach (var key in CanarySelection.Choose(catalog.VectorSets.LivePageKeysOf(encoderId), settings.Pages))
        {
            if (catalog.VectorSets.Find(encoderId, key) is { Live: true } record && catalog.Pages.Find(key) is { } page)
            {
                records.Add(record);
                pages.Add(PageInput.From(page, words, rootPaths));
            }
        }

        var comparison = new CanaryComparison(settings);
        if (pages.Count > 0)
        {
            var fresh = encoder.EncodePages(pages, cancellationToken);
            using var stored = store.OpenSelected(encoderId, records);

            // A canary whose stored bytes cannot be read is damage (verify reports it), not drift: it is skipped.
            var freshByKey = records.Select((r, i) => (r.PageKey, i)).ToDictionary(p => p.PageKey, p => fresh[p.i].Vectors, StringComparer.Ordinal);
            for (var i = 0; i < stored.Records.Count; i++)
            {
                comparison.Add(stored.Source.Get(i).Vectors, freshByKey[stored.Records[i].PageKey], encoder.Identity.Dimensions);
            }
        }

        var figures = comparison.Result();
        var encoderRecord = catalog.Encoders.Find(encoderId) ?? new EncoderRecord
        {
            Id = encoderId,
            Name = encoder.Identity.Name,
            Description = encoder.Identity.Description,
            Dimensions = encoder.Identity.Dimensions,
            FirstUsedUtc = nowUtc,
        };
        encoderRecord.CanaryCheckedUtc = nowUtc;
        encoderRecord.CanaryPages = figures.Pages;
        encoderRecord.CanaryVectors = figures.Vectors;
        encoderRecord.CanaryMeanCosine = figures.MeanCosine;
        encoderRecord.CanaryMinimumCosine = figures.MinimumCosine;
        encoderRecord.CanaryDrifted = figures.Drifted;
        catalog.Encoders.Put(encoderRecord);
        return figures;
    }
}
