using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Pipeline;

/// <summary>
/// Keeps, during a dry run, a bounded uniform sample of the new pages of each document kind (reservoir
/// sampling, Vitter's Algorithm R, with a fixed seed so a plan is repeatable) and counts them all. Only
/// the sampled pages keep their words in memory; the calibration times the encoder on them per kind.
/// </summary>
internal sealed class PreviewSampler
{
    private readonly Dictionary<DocumentKind, (long Seen, List<(PageKey Key, PageRecord Page)> Kept)> kinds = [];
    private readonly Random random = new(20261204);

    /// <summary>Offers a new page; returns the key of a page it no longer keeps (evicted), if any.</summary>
    public PageKey? Offer(DocumentKind kind, PageKey key, PageRecord page)
    {
        var (seen, kept) = kinds.TryGetValue(kind, out var found) ? found : (0, []);
        seen++;
        PageKey? evicted = null;
        if (kept.Count < PreviewSampleStratum.SampleLimit)
        {
            kept.Add((key, page));
        }
        else if (random.NextInt64(seen) is var slot && slot < PreviewSampleStratum.SampleLimit)
        {
            evicted = kept[(int)slot].Key;
            kept[(int)slot] = (key, page);
        }
        else
        {
            evicted = key;
        }

        kinds[kind] = (seen, kept);
        return evicted;
    }

    /// <summary>The strata, pages still new at the end of the pass only (a page can lose its last document within the pass).</summary>
    public IReadOnlyList<PreviewSampleStratum> Strata(Func<PageKey, bool> stillNew) =>
        kinds.OrderBy(k => k.Key.ToString(), StringComparer.Ordinal)
            .Select(k => new PreviewSampleStratum(k.Key.ToString().ToLowerInvariant(), k.Value.Seen, k.Value.Kept.Where(p => stillNew(p.Key)).Select(p => p.Page).ToList()))
            .Where(s => s.Sample.Count > 0)
            .ToList();
}
