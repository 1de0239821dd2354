using UglyToad.PdfPig;
using UglyToad.PdfPig.Exceptions;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// Reads a PDF into pages with page keys and words. For each page the canonical form is built from the
/// raw objects first (which proves the page's form graph acyclic and its streams within the decoded-size
/// cap), and only then does the parser load the page for its words.
/// </summary>
internal sealed class PdfDocumentReader
{
    public DocumentContent Read(byte[] file, ReadLimits limits, CancellationToken cancellationToken)
    {
        try
        {
            return ReadPages(file, limits, cancellationToken);
        }
        catch (Exception e) when (e is DocumentReadException or OperationCanceledException or OutOfMemoryException)
        {
            throw;
        }
        catch (PdfDocumentEncryptedException e)
        {
            throw new DocumentReadException(QuarantineReason.Encrypted, "the PDF is encrypted: " + e.Message, e);
        }
        catch (Exception e)
        {
            // Damaged files make the parser throw exceptions of every type; all of them mean the same.
            throw new DocumentReadException(QuarantineReason.Corrupt, $"the PDF cannot be parsed ({e.GetType().Name}: {e.Message})", e);
        }
    }

    private static DocumentContent ReadPages(byte[] file, ReadLimits limits, CancellationToken cancellationToken)
    {
        using var document = PdfDocument.Open(file, new ParsingOptions { UseLenientParsing = true, SkipMissingFonts = true });
        if (document.IsEncrypted)
        {
            // Even with an empty user password: its owner asked for protection, so it is not indexed.
            throw new DocumentReadException(QuarantineReason.Encrypted, "the PDF is encrypted");
        }

        if (document.NumberOfPages > limits.MaxPages)
        {
            throw new DocumentReadException(QuarantineReason.TooManyPages, $"{document.NumberOfPages} pages, more than the limit of {limits.MaxPages}");
        }

        var resolver = new PdfObjectResolver(document.Structure);
        var nodes = PdfPageTree.Collect(resolver, document.Structure.Catalog.CatalogDictionary, limits.MaxPages, cancellationToken);
        if (nodes.Count != document.NumberOfPages)
        {
            throw new DocumentReadException(
                QuarantineReason.Corrupt, $"the page tree holds {nodes.Count} pages but the parser counts {document.NumberOfPages}");
        }

        var canonicalizer = new PdfPageCanonicalizer(resolver, limits.MaxDecodedBytesPerStream, cancellationToken);
        var pages = new List<PageContent>(nodes.Count);
        for (var i = 0; i < nodes.Count; i++)
        {
            cancellationToken.ThrowIfCancellationRequested();
            var key = PageKey.Of(canonicalizer.Canonicalize(nodes[i]));
            var visible = canonicalizer.VisibleBox(nodes[i]);
            var page = document.GetPage(i + 1);
            pages.Add(new PageContent(
                i + 1,
                key,
                (float)(visible.Right - visible.Left),
                (float)(visible.Top - visible.Bottom),
                PdfPageCanonicalizer.NormalRotation(nodes[i].Rotate),
                PdfWordExtractor.Extract(page, visible)));
        }

        return new DocumentContent(DocumentKind.Pdf, pages) { Title = DocumentTitle.Clean(document.Information.Title) };
    }
}
