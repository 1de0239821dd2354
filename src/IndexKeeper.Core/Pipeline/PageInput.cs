using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Pipeline;

/// <summary>Turns a catalog page record back into what an encoder takes (words, geometry, and where its file is).</summary>
public static class PageInput
{
    public static PageToEncode From(PageRecord page, PageWordStore words, IReadOnlyDictionary<string, string> rootPaths)
    {
        ArgumentNullException.ThrowIfNull(page);
        var source = rootPaths.TryGetValue(page.SourceRoot, out var rootPath)
            ? Path.Combine(rootPath, page.SourcePath.Replace('/', Path.DirectorySeparatorChar))
            : string.Empty;
        return new PageToEncode(PageKey.Parse(page.Id), source, page.SourcePage, page.Width, page.Height, WordsOf(page, words))
        {
            Rotation = page.Rotation,
        };
    }

    /// <summary>
    /// The page's words in reading order: from the page-word store when the record names a place there, else
    /// from the record itself (a page of a schema-1 catalog, or one not yet committed). Throws
    /// <see cref="InvalidDataException"/> when the stored words fail their checks.
    /// </summary>
    public static IReadOnlyList<PageWord> WordsOf(PageRecord page, PageWordStore words)
    {
        ArgumentNullException.ThrowIfNull(page);
        ArgumentNullException.ThrowIfNull(words);
        return page.WordsAt is { } at
            ? words.Read(PageKey.Parse(page.Id), new PageWordsLocation(at.File, at.Offset, at.Length, (uint)at.Checksum))
            : Words(page.Words);
    }

    internal static List<PageWord> Words(List<WordRecord> records) =>
        records.Select(w => new PageWord(w.T, new PageBox(w.L, w.B, w.R, w.U))).ToList();
}
