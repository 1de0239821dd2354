using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Pipeline;

/// <summary>Turns a page the reader produced into the catalog's page record (words kept for text encoders).</summary>
internal static class PageRecords
{
    public static PageRecord From(PageContent page, FoundFile file, DateTime now) => new()
    {
        Id = page.Key.Hex,
        Width = page.Width,
        Height = page.Height,
        Rotation = page.Rotation,
        Words = page.Words.Select(w => new WordRecord { T = w.Text, L = w.Box.Left, B = w.Box.Bottom, R = w.Box.Right, U = w.Box.Top }).ToList(),
        SourceRoot = file.Root,
        SourcePath = file.RelativePath,
        SourcePage = page.Number,
        FirstSeenUtc = now,
    };
}
