using System.Globalization;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Search;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.Querying;

namespace IndexKeeper.Cli.Output;

/// <summary>
/// <c>search --maps DIR</c>: one PNG per hit, the page's word boxes with the region each query vector
/// matched drawn over them (a rendered page comes with the page-image encoder).
/// </summary>
internal static class MatchMaps
{
    public static void Write(IndexCatalog catalog, PageWordStore store, SearchReport report, string directory)
    {
        Directory.CreateDirectory(directory);
        var rank = 0;
        foreach (var hit in report.Hits)
        {
            rank++;
            if (catalog.Pages.Find(hit.PageKey) is not { Width: > 0, Height: > 0 } page)
            {
                continue;
            }

            var words = PageInput.WordsOf(page, store).Select(w => w.Box).ToList();
            var regions = hit.Matches.Select(m => new PageBox(m.Left, m.Bottom, m.Right, m.Top)).ToList();
            var name = string.Create(CultureInfo.InvariantCulture, $"{rank:00}-{Safe(hit.Path)}-p{hit.Page}.png");
            using var file = File.Create(Path.Combine(directory, name));
            MatchMapRenderer.WritePng(file, page.Width, page.Height, words, regions);
        }
    }

    private static string Safe(string path) =>
        new(Path.GetFileNameWithoutExtension(path).Select(c => char.IsAsciiLetterOrDigit(c) || c is '-' or '_' ? c : '_').Take(60).ToArray());
}
