using IndexKeeper.Core.Documents.Images;
using IndexKeeper.Core.Documents.Ocr;
using IndexKeeper.Core.Documents.Office;
using IndexKeeper.Core.Documents.Pdf;
using IndexKeeper.Core.Documents.Text;

namespace IndexKeeper.Core.Documents;

/// <summary>
/// The in-process reader: checks the file size, reads the file once, and hands it to the reader of the
/// kind its signature bytes name; files without a signature (text, Markdown, HTML, e-mail) go by their
/// extension (docs/readers.md). Pages without a text layer then get words by OCR. Hostile files are
/// bounded here by <see cref="ReadLimits"/> and <see cref="ReaderSettings"/>; crashes and hangs no guard
/// foresaw are the business of the worker process that runs this reader.
/// </summary>
internal sealed class SignatureDocumentReader : IDocumentReader
{
    private readonly PdfDocumentReader pdf = new();
    private readonly SkiaImageReader pngAndJpeg = new();
    private readonly TiffImageReader tiff = new();
    private readonly TextDocumentReader text = new();
    private readonly OfficeDocumentReader office;
    private readonly EmailReader email;
    private readonly PageOcr ocr;

    public SignatureDocumentReader(ReaderSettings settings)
    {
        ArgumentNullException.ThrowIfNull(settings);
        office = new OfficeDocumentReader(new OfficeConverter(settings), pdf);
        email = new EmailReader(settings, ReadAttachment);
        ocr = new PageOcr(settings);
    }

    public DocumentContent Read(string path, ReadLimits limits, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(path);
        ArgumentNullException.ThrowIfNull(limits);
        byte[] file;
        try
        {
            // Opened through the Detect stage's opener: it understands the walker's names for files whose
            // Linux names are not valid UTF-8, which the framework's own file APIs cannot open.
            using var stream = Detect.FileOpener.OpenRead(path);
            if (stream.Length > limits.MaxFileBytes)
            {
                throw new DocumentReadException(QuarantineReason.TooLarge, $"the file has {stream.Length} bytes, more than the limit of {limits.MaxFileBytes}");
            }

            file = new byte[stream.Length];
            stream.ReadExactly(file);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new DocumentReadException(QuarantineReason.Unreadable, $"the file cannot be read: {e.Message}", e);
        }

        if (file.Length > limits.MaxFileBytes)
        {
            throw new DocumentReadException(QuarantineReason.TooLarge, $"the file has {file.Length} bytes, more than the limit of {limits.MaxFileBytes}");
        }

        return Read(file, Path.GetFileName(path), depth: 0, limits, cancellationToken)
            ?? throw new DocumentReadException(
                QuarantineReason.Unsupported,
                file.Length == 0
                    ? "the file is empty"
                    : "the file is none of the kinds read (no known signature in its first bytes, and its extension names no text kind)");
    }

    /// <summary>Reads one file's bytes; null when it is of no kind the reader knows.</summary>
    private DocumentContent? Read(byte[] file, string name, int depth, ReadLimits limits, CancellationToken cancellationToken)
    {
        switch (SignatureSniffer.Sniff(file))
        {
            case DocumentKind.Pdf:
                return ocr.OverPdf(file, pdf.Read(file, limits, cancellationToken), limits, cancellationToken);
            case DocumentKind.Png:
                return ocr.OverImage(file, ".png", pngAndJpeg.Read(file, DocumentKind.Png, limits, cancellationToken), limits, cancellationToken);
            case DocumentKind.Jpeg:
                return ocr.OverImage(file, ".jpg", pngAndJpeg.Read(file, DocumentKind.Jpeg, limits, cancellationToken), limits, cancellationToken);
            case DocumentKind.Tiff:
                return ocr.OverImage(file, ".tif", tiff.Read(file, limits, cancellationToken), limits, cancellationToken);
        }

        if (OfficePackage.IsCandidate(file))
        {
            var (content, drawn) = office.Read(file, limits, cancellationToken);
            return ocr.OverPdf(drawn, content, limits, cancellationToken);
        }

        return TextKinds.ByName(name) switch
        {
            DocumentKind.Email => email.Read(file, depth, limits, cancellationToken),
            DocumentKind.Unknown => null,
            var kind => text.Read(file, kind, limits, cancellationToken),
        };
    }

    private DocumentContent? ReadAttachment(byte[] file, string name, int depth, ReadLimits limits, CancellationToken cancellationToken)
    {
        try
        {
            return Read(file, name, depth, limits, cancellationToken);
        }
        catch (DocumentReadException e)
        {
            throw new DocumentReadException(e.Reason, $"attachment '{name}': {e.Message}", e);
        }
    }
}
