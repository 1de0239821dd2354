using System.Diagnostics;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Search;
using IndexKeeper.Service.Querying;

namespace IndexKeeper.Service.Application;

/// <summary>
/// <c>search</c> and <c>/api/search</c>: runs a query against the live vector sets of one encoder (see
/// <see cref="RankingEncoder"/>) and resolves hits to page locations.
/// </summary>
public sealed class SearchOperation(OpenIndex index, IndexSettings settings, DriftOperation drift)
{
    // Words a snippet shows before and after its first matched word: a line or two of a page (common practice).
    private const int SnippetBefore = 12;
    private const int SnippetAfter = 24;

    public SearchReport Search(string text, int k, CancellationToken cancellationToken) => Search(text, k, SearchFilter.None, cancellationToken);

    /// <summary>
    /// The hits of ranks <c>filter.Offset</c> + 1 to + <paramref name="k"/> among the pages the filter admits.
    /// REQUIRES: <see cref="UnknownRoot"/> found nothing wrong with <paramref name="filter"/>.
    /// </summary>
    public SearchReport Search(string text, int k, SearchFilter filter, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(filter);
        var stopwatch = Stopwatch.StartNew();
        using var ranking = RankingEncoder.Choose(index, settings.Encoder, drift);
        var encoder = ranking.Encoder;
        var query = encoder.EncodeQuery(text, cancellationToken);
        var allowed = filter.SelectsDocuments ? AdmittedPages(filter) : null;
        var top = filter.Offset + k;
        var (result, unreadable) = index.Serving.Search(encoder.Identity.Id, query, top, cancellationToken, allowed);
        var hits = new List<SearchReportHit>(result.Hits.Count);
        foreach (var hit in result.Hits.Where(h => h.Matches.Any(m => m.Similarity >= settings.MinimumTokenSimilarity) && !(h.Score < filter.MinimumScore)))
        {
            var (locations, document) = Locate(index.Catalog, hit.Key.Hex, filter);
            if (locations.Count == 0)
            {
                continue;
            }

            var matched = hit.Matches.Where(m => m.Similarity >= settings.MinimumTokenSimilarity).Select(m => m.Region).ToHashSet();

            var page = WordsOf(index.Catalog.Pages.Find(hit.Key.Hex));
            hits.Add(new SearchReportHit
            {
                Root = locations[0].Root,
                Path = locations[0].Path,
                Page = locations[0].Page,
                Score = Math.Round(hit.Score, 6),
                PageKey = hit.Key.Hex,
                AlsoAt = locations.Skip(1).ToList(),
                Matches = hit.Matches.Select((m, i) => new SearchReportMatch(
                    i, m.VectorIndex, Math.Round(m.Similarity, 6), m.Region.Left, m.Region.Bottom, m.Region.Right, m.Region.Top, WordAt(page, m))).ToList(),
                Snippet = Snippet(page, matched),
                DocumentSize = document!.Size,
                DocumentModifiedUtc = new DateTime(document.ModifiedTicksUtc, DateTimeKind.Utc),
                DocumentKind = document.Kind.ToString(),
                DocumentTitle = document.Title,
            });
        }

        return new SearchReport
        {
            Query = text,
            Offset = filter.Offset,

            // The ranking was cut at offset + k: when it was full there may be more.
            NextOffset = result.Hits.Count >= top && filter.Offset + k <= SearchFilter.MaxOffset ? filter.Offset + k : null,
            Encoder = encoder.Identity.Name + " " + encoder.Identity.Id[..12],
            ServingEncoderId = ranking.ServingEncoderId,
            Notice = ranking.Notice,
            QueryVectors = query.Count,
            PagesScanned = result.PagesScanned,
            CandidatesReranked = result.CandidatesReranked,
            ElapsedMilliseconds = Math.Round(stopwatch.Elapsed.TotalMilliseconds, 2),
            Hits = [.. hits.Skip(filter.Offset).Take(k)],
            VectorSetsUnreadable = unreadable,
        };
    }

    /// <summary>The first root filter names that neither the configuration nor the index knows, as a message; null when none.</summary>
    public string? UnknownRoot(SearchFilter filter)
    {
        ArgumentNullException.ThrowIfNull(filter);
        if (filter.Roots.Count == 0)
        {
            return null;
        }

        var known = settings.Scan.Roots.Select(r => r.Name).Concat(index.Catalog.Documents.RootNames()).ToHashSet(StringComparer.Ordinal);
        return filter.Roots.FirstOrDefault(r => !known.Contains(r)) is { } unknown
            ? $"root '{unknown}' is not a root of this index; known: {string.Join(", ", known.Order(StringComparer.Ordinal))}."
            : null;
    }

    /// <summary>Page keys of the live documents the filter admits (read from the catalog per query; only when a filter selects documents).</summary>
    private HashSet<string> AdmittedPages(SearchFilter filter)
    {
        var documents = filter.Roots.Count > 0 ? filter.Roots.SelectMany(index.Catalog.Documents.OfRoot) : index.Catalog.Documents.All();
        return documents.Where(filter.Admits).SelectMany(d => d.PageKeys).ToHashSet(StringComparer.Ordinal);
    }

    /// <summary>Every location of the page key the filter admits, first by root and path, and the document of the first.</summary>
    private static (List<PageLocation> Locations, DocumentRecord? First) Locate(IndexCatalog catalog, string pageKey, SearchFilter filter)
    {
        var locations = new List<PageLocation>();
        DocumentRecord? first = null;
        foreach (var document in catalog.Documents.Holding(pageKey).Where(filter.Admits).OrderBy(d => d.Root, StringComparer.Ordinal).ThenBy(d => d.Path, StringComparer.Ordinal))
        {
            first ??= document;
            for (var i = 0; i < document.PageKeys.Count; i++)
            {
                if (document.PageKeys[i] == pageKey)
                {
                    locations.Add(new PageLocation(document.Root, document.Path, i + 1));
                }
            }
        }

        return (locations, first);
    }

    /// <summary>The page's words in reading order; none when the page is gone or its stored words fail their checks (verify names those).</summary>
    private IReadOnlyList<PageWord> WordsOf(PageRecord? page)
    {
        if (page is null)
        {
            return [];
        }

        try
        {
            return PageInput.WordsOf(page, index.Words);
        }
        catch (Exception ex) when (ex is InvalidDataException or IOException)
        {
            Trace.TraceWarning($"No snippet for page {page.Id}: {ex.Message}");
            return [];
        }
    }

    /// <summary>The page's words around the first word whose box a query vector matched, matched words in «».</summary>
    internal static string Snippet(IReadOnlyList<PageWord> page, IReadOnlySet<PageBox> matched)
    {
        if (page.Count == 0)
        {
            return string.Empty;
        }

        bool IsMatched(PageWord w) => matched.Contains(w.Box);
        var first = page.ToList().FindIndex(IsMatched);
        var start = Math.Max(0, first - SnippetBefore);
        var end = Math.Min(page.Count, Math.Max(first, 0) + SnippetAfter + 1);
        var words = page.Skip(start).Take(end - start).Select(w => IsMatched(w) ? "«" + w.Text + "»" : w.Text);
        return (start > 0 ? "… " : string.Empty) + string.Join(' ', words) + (end < page.Count ? " …" : string.Empty);
    }

    private static string? WordAt(IReadOnlyList<PageWord> page, TokenMatch match) =>
        page.FirstOrDefault(w => w.Box == match.Region)?.Text;
}
