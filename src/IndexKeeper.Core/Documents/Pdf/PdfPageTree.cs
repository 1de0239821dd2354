using UglyToad.PdfPig.Core;
using UglyToad.PdfPig.Tokens;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// Walks the page tree (ISO 32000-1 §7.7.3) from the catalog in page order, without loading any page,
/// so the guards can run before the parser touches a page. A tree that loops is corrupt.
/// </summary>
internal static class PdfPageTree
{
    public static List<PdfPageNode> Collect(PdfObjectResolver resolver, DictionaryToken catalog, int maxPages, CancellationToken cancellationToken)
    {
        var pages = new List<PdfPageNode>();
        var visited = new HashSet<IndirectReference>();
        var root = catalog.Data.GetValueOrDefault("Pages");
        var pending = new Stack<(IToken Node, DictionaryToken? Resources, ArrayToken? MediaBox, ArrayToken? CropBox, int Rotate)>();
        if (root is not null)
        {
            pending.Push((root, null, null, null, 0));
        }

        while (pending.Count > 0)
        {
            cancellationToken.ThrowIfCancellationRequested();
            var (token, resources, mediaBox, cropBox, rotate) = pending.Pop();
            if (token is IndirectReferenceToken reference && !visited.Add(reference.Data))
            {
                throw new DocumentReadException(QuarantineReason.Corrupt, $"the page tree loops back to object {reference.Data.ObjectNumber}");
            }

            if (resolver.Resolve(token) is not DictionaryToken node)
            {
                continue;
            }

            resources = resolver.Get<DictionaryToken>(node, "Resources") ?? resources;
            mediaBox = resolver.Get<ArrayToken>(node, "MediaBox") ?? mediaBox;
            cropBox = resolver.Get<ArrayToken>(node, "CropBox") ?? cropBox;
            if (resolver.Get<NumericToken>(node, "Rotate") is { } rotation)
            {
                rotate = (int)Math.Clamp(rotation.Data, -36000, 36000);
            }

            var kids = resolver.Get<ArrayToken>(node, "Kids");
            var type = resolver.Get<NameToken>(node, "Type")?.Data;
            if (kids is not null && type != "Page")
            {
                // Push in reverse so kids come off the stack in their order.
                for (var i = kids.Data.Count - 1; i >= 0; i--)
                {
                    pending.Push((kids.Data[i], resources, mediaBox, cropBox, rotate));
                }

                continue;
            }

            if (type == "Pages")
            {
                continue;
            }

            pages.Add(new PdfPageNode(node, resources, mediaBox, cropBox, rotate));
            if (pages.Count > maxPages)
            {
                throw new DocumentReadException(QuarantineReason.TooManyPages, $"more than {maxPages} pages (the limit)");
            }
        }

        return pages;
    }
}
