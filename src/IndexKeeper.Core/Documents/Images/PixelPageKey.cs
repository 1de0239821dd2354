using System.Security.Cryptography;
using IndexKeeper.Core.Documents.Pdf;

namespace IndexKeeper.Core.Documents.Images;

/// <summary>
/// The canonical form of a page of pixels (docs/page-keys.md, "Pixel pages"): its size, its stored
/// orientation and the SHA-256 of its pixels decoded to 8-bit RGBA, so the same pixels give the same
/// key whichever file format, compression or metadata carried them.
/// </summary>
internal static class PixelPageKey
{
    /// <summary>Names the pixel layout that is hashed (8-bit R, G, B, A, alpha not premultiplied). Never change.</summary>
    private static ReadOnlySpan<byte> Layout => "RGBA8"u8;

    public static PageKey Of(int width, int height, int orientation, ReadOnlySpan<byte> rgbaPixels)
    {
        var writer = new CanonicalWriter();
        writer.Raw(PageKeyFormat.Magic);
        writer.UInt32(PageKeyFormat.Version);
        writer.Byte(PageKeyFormat.PixelPage);
        writer.UInt32((uint)width);
        writer.UInt32((uint)height);
        writer.UInt32((uint)orientation);
        writer.Tagged(CanonicalWriter.KeywordTag, Layout);
        writer.Raw(SHA256.HashData(rgbaPixels));
        return PageKey.Of(writer.WrittenSpan);
    }

    /// <summary>
    /// Clockwise rotation a viewer applies for an orientation tag (TIFF 6.0 tag 274, the same values in
    /// Exif): 6 is 90, 3 is 180, 8 is 270; mirrored orientations report 0 and still count in the key.
    /// </summary>
    public static int Rotation(int orientation) => orientation switch
    {
        6 => 90,
        3 => 180,
        8 => 270,
        _ => 0,
    };

    /// <summary>Refuses an image whose decoded pixels would pass the per-stream cap, before decoding it.</summary>
    public static void CheckSize(long width, long height, ReadLimits limits)
    {
        if (width <= 0 || height <= 0)
        {
            throw new DocumentReadException(QuarantineReason.Corrupt, $"the image has no pixels ({width}×{height})");
        }

        if (width * height * 4 > limits.MaxDecodedBytesPerStream)
        {
            throw new DocumentReadException(
                QuarantineReason.DecodedStreamTooLarge,
                $"the image is {width}×{height} pixels, more than {limits.MaxDecodedBytesPerStream} bytes decoded (the limit per stream)");
        }
    }
}
