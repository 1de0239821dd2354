using SkiaSharp;

namespace IndexKeeper.Core.Documents.Images;

/// <summary>Reads a PNG or JPEG file as a one-page document keyed on its decoded pixels.</summary>
internal sealed class SkiaImageReader
{
    public DocumentContent Read(byte[] file, DocumentKind kind, ReadLimits limits, CancellationToken cancellationToken)
    {
        using var data = SKData.CreateCopy(file);
        using var codec = SKCodec.Create(data)
            ?? throw new DocumentReadException(QuarantineReason.Corrupt, $"the {kind} file cannot be decoded");
        var info = codec.Info;
        PixelPageKey.CheckSize(info.Width, info.Height, limits);
        cancellationToken.ThrowIfCancellationRequested();

        // No colour space on the target: pixels are taken as stored, without colour management.
        var target = new SKImageInfo(info.Width, info.Height, SKColorType.Rgba8888, SKAlphaType.Unpremul);
        var pixels = new byte[target.BytesSize];
        var result = codec.GetPixels(target, pixels);
        if (result != SKCodecResult.Success)
        {
            throw new DocumentReadException(QuarantineReason.Corrupt, $"the {kind} file does not decode completely ({result})");
        }

        var orientation = (int)codec.EncodedOrigin;
        var key = PixelPageKey.Of(info.Width, info.Height, orientation, pixels);
        var page = new PageContent(1, key, info.Width, info.Height, PixelPageKey.Rotation(orientation), []);
        return new DocumentContent(kind, [page]);
    }
}
