using System.Globalization;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Search;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.Querying;

namespace IndexKeeper.Cli.Output;

/// <summary>
/// <c>search --maps DIR</c>: one PNG per hit, the region each query vector matched drawn over the page
/// itself (PDF pages drawn by pdftoppm, PNG and JPEG pages as they are) or, where the page cannot be drawn
/// (other kinds, a file changed since it was read), over its word boxes. The maps a previous search wrote
/// into the folder are removed first: they are listed in <see cref="ListName"/>, and nothing else there is
/// touched.
/// </summary>
internal static class MatchMaps
{
    /// <summary>The folder's list of the maps the last search wrote there, one file name a line.</summary>
    public const string ListName = ".indexkeeper-maps";

    /// <returns>One note per map drawn over word boxes instead of the page, saying why.</returns>
    public static IReadOnlyList<string> Write(IndexCatalog catalog, PageWordStore store, SearchReport report, string directory, IReadOnlyDictionary<string, string> rootPaths)
    {
        Directory.CreateDirectory(directory);
        RemovePrevious(directory);
        var written = new List<string>();
        var notes = new List<string>();
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
            var (backdrop, why) = Backdrop(catalog, hit, page, rootPaths);
            using (var file = File.Create(Path.Combine(directory, name)))
            {
                why ??= MatchMapRenderer.WritePng(file, page.Width, page.Height, words, regions, backdrop: backdrop);
            }

            written.Add(name);
            if (why is not null)
            {
                notes.Add($"{name}: word boxes, not the page ({why})");
            }
        }

        File.WriteAllLines(Path.Combine(directory, ListName), written);
        return notes;
    }

    /// <summary>The hit's page as a file to draw, when it is still the file the index read, inside its root.</summary>
    private static (MapBackdrop? Backdrop, string? Why) Backdrop(IndexCatalog catalog, SearchReportHit hit, PageRecord page, IReadOnlyDictionary<string, string> rootPaths)
    {
        if (!rootPaths.TryGetValue(hit.Root, out var root) || catalog.Documents.Find(hit.Root, hit.Path) is not { } document)
        {
            return (null, "its root is not configured here");
        }

        if (!MapBackdrop.Draws(document.Kind))
        {
            return (null, $"pages of kind {document.Kind} are not drawn");
        }

        var rootPath = Path.GetFullPath(root);
        var path = Path.GetFullPath(Path.Combine(rootPath, hit.Path));
        var file = new FileInfo(path);

        // Never read outside the root or through a link put there since the scan (it never follows links).
        if (!path.StartsWith(Path.TrimEndingDirectorySeparator(rootPath) + Path.DirectorySeparatorChar, StringComparison.Ordinal)
            || !file.Exists || file.LinkTarget is not null)
        {
            return (null, "the file is not there");
        }

        if (file.Length != document.Size || file.LastWriteTimeUtc.Ticks != document.ModifiedTicksUtc)
        {
            return (null, "the file changed since it was read");
        }

        return (new MapBackdrop(path, document.Kind, hit.Page, page.Rotation), null);
    }

    /// <summary>Removes the maps the list names (plain file names only), then the list.</summary>
    private static void RemovePrevious(string directory)
    {
        var list = Path.Combine(directory, ListName);
        if (!File.Exists(list))
        {
            return;
        }

        foreach (var name in File.ReadAllLines(list))
        {
            if (name.Length > 0 && name == Path.GetFileName(name) && name.EndsWith(".png", StringComparison.Ordinal))
            {
                File.Delete(Path.Combine(directory, name));
            }
        }

        File.Delete(list);
    }

    private static string Safe(string path) =>
        new(Path.GetFileNameWithoutExtension(path).Select(c => char.IsAsciiLetterOrDigit(c) || c is '-' or '_' ? c : '_').Take(60).ToArray());
}
