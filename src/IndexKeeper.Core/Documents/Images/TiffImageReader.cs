using SixLabors.ImageSharp;
using SixLabors.ImageSharp.PixelFormats;

namespace IndexKeeper.Core.Documents.Images;

/// <summary>
/// Reads a TIFF file as a document of one page per image directory, keyed on decoded pixels.
/// </summary>
/// <remarks>
/// The decoder is the image library's 2.1 line, which has published security advisories for crafted
/// files. It is acceptable here because documents are read in an isolated worker process that a
/// supervisor restarts with a per-document watchdog, and because the page count and decoded size are
/// checked from the directories before the decoder runs.
/// </remarks>
internal sealed class TiffImageReader
{
    public DocumentContent Read(byte[] file, ReadLimits limits, CancellationToken cancellationToken)
    {
        var directories = TiffDirectoryScanner.Scan(file, limits.MaxPages);
        foreach (var (width, height, _) in directories)
        {
            PixelPageKey.CheckSize(width, height, limits);
        }

        cancellationToken.ThrowIfCancellationRequested();
        Image<Rgba32> image;
        try
        {
            image = Image.Load<Rgba32>(file);
        }
        catch (Exception e) when (e is not (OutOfMemoryException or OperationCanceledException))
        {
            // Damaged files make decoders throw exceptions of many types; all of them mean the same.
            throw new DocumentReadException(QuarantineReason.Corrupt, $"the TIFF file cannot be decoded ({e.GetType().Name}: {e.Message})", e);
        }

        using (image)
        {
            var pages = new List<PageContent>(image.Frames.Count);
            for (var i = 0; i < image.Frames.Count; i++)
            {
                cancellationToken.ThrowIfCancellationRequested();
                var frame = image.Frames[i];
                var pixels = new byte[frame.Width * frame.Height * 4];
                frame.CopyPixelDataTo(pixels);
                var orientation = i < directories.Count ? directories[i].Orientation : 1;
                var key = PixelPageKey.Of(frame.Width, frame.Height, orientation, pixels);
                pages.Add(new PageContent(i + 1, key, frame.Width, frame.Height, PixelPageKey.Rotation(orientation), []));
            }

            return new DocumentContent(DocumentKind.Tiff, pages);
        }
    }
}
