using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;

namespace IndexKeeper.Core.Pipeline;

/// <summary>Turns a catalog page record back into what an encoder takes (words, geometry, and where its file is).</summary>
internal static class PageInput
{
    public static PageToEncode From(PageRecord page, IReadOnlyDictionary<string, string> rootPaths)
    {
        var source = rootPaths.TryGetValue(page.SourceRoot, out var rootPath)
            ? Path.Combine(rootPath, page.SourcePath.Replace('/', Path.DirectorySeparatorChar))
            : string.Empty;
        var words = page.Words.Select(w => new PageWord(w.T, new PageBox(w.L, w.B, w.R, w.U))).ToList();
        return new PageToEncode(PageKey.Parse(page.Id), source, page.SourcePage, page.Width, page.Height, words)
        {
            Rotation = page.Rotation,
        };
    }
}
