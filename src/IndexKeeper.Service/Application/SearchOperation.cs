using System.Diagnostics;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Search;
using IndexKeeper.Service.Querying;

namespace IndexKeeper.Service.Application;

/// <summary>
/// <c>search</c> and <c>/api/search</c>: runs a query against the live vector sets of one encoder (see
/// <see cref="RankingEncoder"/>) and resolves hits to page locations.
/// </summary>
public sealed class SearchOperation(OpenIndex index, IndexSettings settings, DriftOperation drift)
{
    public SearchReport Search(string text, int k, CancellationToken cancellationToken)
    {
        var stopwatch = Stopwatch.StartNew();
        using var ranking = RankingEncoder.Choose(index, settings.Encoder, drift);
        var encoder = ranking.Encoder;
        var query = encoder.EncodeQuery(text, cancellationToken);
        var (result, unreadable) = index.Serving.Search(encoder.Identity.Id, query, k, cancellationToken);
        var hits = new List<SearchReportHit>(result.Hits.Count);
        foreach (var hit in result.Hits)
        {
            var locations = Locate(index.Catalog, hit.Key.Hex);
            if (locations.Count == 0)
            {
                continue;
            }

            var page = index.Catalog.Pages.Find(hit.Key.Hex);
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
            });
        }

        return new SearchReport
        {
            Query = text,
            Encoder = encoder.Identity.Name + " " + encoder.Identity.Id[..12],
            ServingEncoderId = ranking.ServingEncoderId,
            Notice = ranking.Notice,
            QueryVectors = query.Count,
            PagesScanned = result.PagesScanned,
            CandidatesReranked = result.CandidatesReranked,
            ElapsedMilliseconds = Math.Round(stopwatch.Elapsed.TotalMilliseconds, 2),
            Hits = hits,
            VectorSetsUnreadable = unreadable,
        };
    }

    private static List<PageLocation> Locate(IndexCatalog catalog, string pageKey)
    {
        var locations = new List<PageLocation>();
        foreach (var document in catalog.Documents.Holding(pageKey).OrderBy(d => d.Root, StringComparer.Ordinal).ThenBy(d => d.Path, StringComparer.Ordinal))
        {
            for (var i = 0; i < document.PageKeys.Count; i++)
            {
                if (document.PageKeys[i] == pageKey)
                {
                    locations.Add(new PageLocation(document.Root, document.Path, i + 1));
                }
            }
        }

        return locations;
    }

    private static string? WordAt(PageRecord? page, TokenMatch match) =>
        page?.Words.FirstOrDefault(w => w.L == match.Region.Left && w.B == match.Region.Bottom && w.R == match.Region.Right && w.U == match.Region.Top)?.T;
}
