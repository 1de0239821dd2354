using IndexKeeper.Core.Documents.Images;
using IndexKeeper.Core.Documents.Pdf;

namespace IndexKeeper.Core.Documents;

/// <summary>
/// The in-process reader: checks the file size, reads the file once, and hands it to the reader of the
/// kind its signature bytes name. Hostile files are bounded here by <see cref="ReadLimits"/>; crashes
/// and hangs no guard foresaw are the business of the worker process that runs this reader.
/// </summary>
internal sealed class SignatureDocumentReader : IDocumentReader
{
    private readonly PdfDocumentReader pdf = new();
    private readonly SkiaImageReader pngAndJpeg = new();
    private readonly TiffImageReader tiff = new();

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

        return SignatureSniffer.Sniff(file) switch
        {
            DocumentKind.Pdf => pdf.Read(file, limits, cancellationToken),
            DocumentKind.Png => pngAndJpeg.Read(file, DocumentKind.Png, limits, cancellationToken),
            DocumentKind.Jpeg => pngAndJpeg.Read(file, DocumentKind.Jpeg, limits, cancellationToken),
            DocumentKind.Tiff => tiff.Read(file, limits, cancellationToken),
            _ => throw new DocumentReadException(
                QuarantineReason.Unsupported,
                file.Length == 0 ? "the file is empty" : "the file is not a PDF, PNG, JPEG or TIFF (no known signature in its first bytes)"),
        };
    }
}
