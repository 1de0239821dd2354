using System.Diagnostics;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Encoding.TextTokens;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Churn.Strategies;

/// <summary>
/// Encoder seconds per page of the minilm text-token encoder, measured on a sample of the store's pages
/// in the same run (one warm-up page first, so model loading is not counted as page time).
/// </summary>
internal static class MiniLmTiming
{
    public static (double SecondsPerPage, int Pages) Measure(OpenIndex session, int sample)
    {
        var pages = session.Catalog.Pages.All().Where(p => p.References > 0).OrderBy(p => p.Id, StringComparer.Ordinal)
            .Select(p => (Page: p, Words: PageInput.WordsOf(p, session.Words))).Where(p => p.Words.Count > 0).ToList();
        var step = Math.Max(1, pages.Count / Math.Max(1, sample));
        var chosen = pages.Where((_, i) => i % step == 0).Take(sample + 1).Select(p => new PageToEncode(
            PageKey.Parse(p.Page.Id), string.Empty, p.Page.SourcePage, p.Page.Width, p.Page.Height, p.Words)).ToList();
        if (chosen.Count < 2)
        {
            return (double.NaN, 0);
        }

        var encoder = EncoderFactory.Create(new EncoderOptions { Name = TextTokenEncoderFactory.Name });
        try
        {
            encoder.EncodePages([chosen[0]], CancellationToken.None);
            var stopwatch = Stopwatch.StartNew();
            foreach (var batch in chosen.Skip(1).Chunk(8))
            {
                encoder.EncodePages(batch, CancellationToken.None);
            }

            return (stopwatch.Elapsed.TotalSeconds / (chosen.Count - 1), chosen.Count - 1);
        }
        finally
        {
            (encoder as IDisposable)?.Dispose();
        }
    }
}
