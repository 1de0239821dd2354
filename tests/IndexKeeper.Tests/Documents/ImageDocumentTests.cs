using IndexKeeper.Core.Documents;
using SixLabors.ImageSharp;
using SixLabors.ImageSharp.Formats.Jpeg;
using SixLabors.ImageSharp.Formats.Png;
using SixLabors.ImageSharp.Formats.Tiff;
using SixLabors.ImageSharp.Formats.Tiff.Constants;
using SixLabors.ImageSharp.PixelFormats;

namespace IndexKeeper.Tests.Documents;

/// <summary>
/// PNG, JPEG and TIFF files are keyed on decoded pixels: the same pixels in another encoding keep the
/// key, one changed pixel does not. Files are written by an independent encoder library from the
/// registry or by hand from the format specifications.
/// </summary>
public sealed class ImageDocumentTests : IDisposable
{
    private const int Width = 37;
    private const int Height = 23;

    private readonly TempFolder folder = new();

    [Fact]
    public void Png_with_another_compression_level_keeps_its_key_and_a_changed_pixel_does_not()
    {
        var fast = Encode(Picture(), new PngEncoder { CompressionLevel = PngCompressionLevel.BestSpeed, FilterMethod = PngFilterMethod.None });
        var small = Encode(Picture(), new PngEncoder { CompressionLevel = PngCompressionLevel.BestCompression, FilterMethod = PngFilterMethod.Paeth });
        var withAlpha = Encode(Picture(), new PngEncoder { ColorType = PngColorType.RgbWithAlpha });
        var changed = Encode(Picture(changePixel: true), new PngEncoder { CompressionLevel = PngCompressionLevel.BestSpeed, FilterMethod = PngFilterMethod.None });
        Assert.NotEqual(fast, small);

        var page = folder.Read(fast).Pages.Single();
        Assert.Equal(DocumentKind.Png, folder.Read(fast).Kind);
        Assert.Equal((Width, Height, 0), ((int)page.Width, (int)page.Height, page.Rotation));
        Assert.Empty(page.Words);
        Assert.Equal(page.Key, folder.Read(small).Pages.Single().Key);
        Assert.Equal(page.Key, folder.Read(withAlpha).Pages.Single().Key); // opaque alpha adds no visible pixel
        Assert.NotEqual(page.Key, folder.Read(changed).Pages.Single().Key);
    }

    [Fact]
    public void Jpeg_with_a_comment_segment_keeps_its_key_and_a_changed_pixel_does_not()
    {
        var jpeg = Encode(Picture(), new JpegEncoder { Quality = 100 });

        // ITU-T T.81 §B.2.4.5: a COM marker (FF FE) with a two-byte length may follow SOI; decoders skip it.
        var comment = "Harrowmere site photo"u8.ToArray();
        var withComment = jpeg[..2].Concat(new byte[] { 0xFF, 0xFE, 0, (byte)(comment.Length + 2) }).Concat(comment).Concat(jpeg[2..]).ToArray();
        var changed = Encode(Picture(changePixel: true), new JpegEncoder { Quality = 100 });

        var key = folder.Read(jpeg).Pages.Single().Key;
        Assert.Equal(DocumentKind.Jpeg, folder.Read(jpeg).Kind);
        Assert.Equal(key, folder.Read(withComment).Pages.Single().Key);
        Assert.NotEqual(key, folder.Read(changed).Pages.Single().Key);
    }

    [Fact]
    public void Tiff_pages_are_keyed_on_pixels_whatever_the_compression()
    {
        var first = Rgb(Picture());
        var second = Rgb(Picture(shift: 50));
        var plain = TiffWriter.Rgb([(Width, Height, first), (Width, Height, second)]);
        var packed = TiffWriter.Rgb([(Width, Height, first), (Width, Height, second)], packBits: true);
        var secondChanged = Rgb(Picture(shift: 50, changePixel: true));
        var edited = TiffWriter.Rgb([(Width, Height, first), (Width, Height, secondChanged)]);

        var keys = folder.Read(plain).Pages.Select(p => p.Key).ToList();
        Assert.Equal(DocumentKind.Tiff, folder.Read(plain).Kind);
        Assert.Equal(2, keys.Count);
        Assert.NotEqual(keys[0], keys[1]);
        Assert.Equal(keys, folder.Read(packed).Pages.Select(p => p.Key));

        var editedKeys = folder.Read(edited).Pages.Select(p => p.Key).ToList();
        Assert.Equal(keys[0], editedKeys[0]);
        Assert.NotEqual(keys[1], editedKeys[1]);

        // The same pixels keep their key across formats: Deflate TIFF from the encoder library, and PNG.
        var deflate = Encode(Picture(), new TiffEncoder { Compression = TiffCompression.Deflate, BitsPerPixel = TiffBitsPerPixel.Bit24 });
        Assert.Equal(keys[0], folder.Read(deflate).Pages.Single().Key);
        Assert.Equal(keys[0], folder.Read(Encode(Picture(), new PngEncoder())).Pages.Single().Key);
    }

    [Fact]
    public void An_image_larger_than_the_decoded_cap_is_refused_before_decoding()
    {
        var png = Encode(Picture(), new PngEncoder());
        var error = folder.ReadFails(png, ReadLimits.Default with { MaxDecodedBytesPerStream = (Width * Height * 4) - 1 });
        Assert.Equal(QuarantineReason.DecodedStreamTooLarge, error.Reason);

        var tiff = TiffWriter.Rgb([(Width, Height, Rgb(Picture())), (Width, Height, Rgb(Picture()))]);
        Assert.Equal(QuarantineReason.TooManyPages, folder.ReadFails(tiff, ReadLimits.Default with { MaxPages = 1 }).Reason);
    }

    [Fact]
    public void A_truncated_png_is_corrupt()
    {
        var png = Encode(Picture(), new PngEncoder());
        Assert.Equal(QuarantineReason.Corrupt, folder.ReadFails(png[..(png.Length / 2)]).Reason);
    }

    public void Dispose() => folder.Dispose();

    private static Image<Rgb24> Picture(int shift = 0, bool changePixel = false)
    {
        var image = new Image<Rgb24>(Width, Height);
        for (var y = 0; y < Height; y++)
        {
            for (var x = 0; x < Width; x++)
            {
                image[x, y] = new Rgb24((byte)((x * 7) + shift), (byte)(y * 11), (byte)((x + y) * 3));
            }
        }

        if (changePixel)
        {
            var p = image[20, 10];
            image[20, 10] = new Rgb24((byte)(p.R ^ 0x40), p.G, p.B);
        }

        return image;
    }

    private static byte[] Rgb(Image<Rgb24> image)
    {
        using (image)
        {
            var bytes = new byte[Width * Height * 3];
            image.CopyPixelDataTo(bytes);
            return bytes;
        }
    }

    private static byte[] Encode(Image<Rgb24> image, SixLabors.ImageSharp.Formats.IImageEncoder encoder)
    {
        using (image)
        {
            var output = new MemoryStream();
            image.Save(output, encoder);
            return output.ToArray();
        }
    }
}
