using IndexKeeper.Core.Documents.Pdf;

namespace IndexKeeper.Core.Documents.Office;

/// <summary>
/// Reads an office or OpenDocument file: the package is inspected, LibreOffice renders it to PDF, and the
/// PDF goes through the PDF reader; each page's key is then salted with the converter's version.
/// </summary>
internal sealed class OfficeDocumentReader(OfficeConverter converter, PdfDocumentReader pdf)
{
    /// <summary>The document, and the PDF it was drawn as (for OCR of its pages).</summary>
    public (DocumentContent Content, byte[] Pdf) Read(byte[] file, ReadLimits limits, CancellationToken cancellationToken)
    {
        var (kind, extension) = OfficePackage.Inspect(file, limits, cancellationToken);
        var version = converter.Version;
        var drawn = converter.ConvertToPdf(file, extension, limits, cancellationToken);
        DocumentContent content;
        try
        {
            content = pdf.Read(drawn, limits, cancellationToken);
        }
        catch (DocumentReadException e) when (e.Reason is QuarantineReason.Corrupt or QuarantineReason.Encrypted)
        {
            throw new DocumentReadException(QuarantineReason.ConversionFailed, "LibreOffice wrote a PDF the PDF reader refuses: " + e.Message, e);
        }

        var pages = content.Pages.Select(p => p with { Key = ConvertedPageKey.Of(version, p.Key) }).ToList();
        return (new DocumentContent(kind, pages) { Title = content.Title }, drawn);
    }
}
