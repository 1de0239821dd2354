using System.Diagnostics;
using IndexKeeper.Core.Encoding.PageImages;
using IndexKeeper.Tests.Documents;
using SkiaSharp;

namespace IndexKeeper.Tests.Encoding.PageImages;

/// <summary>
/// The Netpbm reader against the PPM and PGM format specifications (netpbm.sourceforge.net/doc/ppm.html,
/// pgm.html), and against poppler's pdftoppm: its PPM output read by us equals its PNG output of the same
/// page decoded by SkiaSharp (a reference decoder).
/// </summary>
public sealed class NetpbmReaderTests
{
    [Fact]
    public void Reads_a_P6_image_rows_top_first_samples_R_G_B()
    {
        // Spec: magic "P6", white space, width, white space, height, white space, maxval, one white-space character, raster.
        var image = Read("P6\n2 2\n255\n", [255, 0, 0, 0, 255, 0, 0, 0, 255, 10, 20, 30]);

        Assert.Equal((2, 2, 3), (image.Width, image.Height, image.Channels));
        Assert.Equal(new byte[] { 255, 0, 0, 0, 255, 0, 0, 0, 255, 10, 20, 30 }, image.Pixels);
    }

    [Fact]
    public void Comments_are_ignored_anywhere_before_the_raster_and_white_space_may_be_tabs_and_CRs()
    {
        // Spec (PBM, referenced by PPM): from "#" through the next CR or LF is a comment; white space is blanks, TABs, CRs, LFs.
        var image = Read("P6 # by hand\n\t2\r\n# a comment line\n1 255\n", [1, 2, 3, 4, 5, 6]);

        Assert.Equal((2, 1), (image.Width, image.Height));
        Assert.Equal(new byte[] { 1, 2, 3, 4, 5, 6 }, image.Pixels);
    }

    [Fact]
    public void The_byte_after_maxval_is_the_only_delimiter_so_a_raster_may_start_with_white_space_bytes()
    {
        // Spec: "a single whitespace character" ends the header; raster bytes 0x0A and 0x20 are samples.
        var image = Read("P6 1 1 255\n", [(byte)'\n', (byte)' ', 9]);

        Assert.Equal(new byte[] { 10, 32, 9 }, image.Pixels);
    }

    [Fact]
    public void Small_maxval_scales_to_eight_bits()
    {
        // Spec: samples run from 0 to maxval; 15 is white at maxval 15.
        var image = Read("P6 1 1 15\n", [15, 0, 7]);

        Assert.Equal(new byte[] { 255, 0, 119 }, image.Pixels);
    }

    [Fact]
    public void Maxval_above_255_uses_two_bytes_most_significant_first()
    {
        // Spec: "If the Maxval is less than 256, it is 1 byte. Otherwise, it is 2 bytes. The most significant byte is first."
        var image = Read("P6 1 1 1000\n", [0x03, 0xE8, 0x01, 0xF4, 0x00, 0x00]);

        Assert.Equal(new byte[] { 255, 128, 0 }, image.Pixels);
    }

    [Fact]
    public void P5_is_one_grey_sample_a_pixel()
    {
        var image = Read("P5 3 1 255\n", [0, 128, 255]);

        Assert.Equal((3, 1, 1), (image.Width, image.Height, image.Channels));
        Assert.Equal(new byte[] { 0, 128, 255 }, image.Pixels);
    }

    [Fact]
    public void Images_back_to_back_are_read_in_turn_then_a_clean_end_gives_null()
    {
        // Spec: a PPM file is a sequence of one or more images with nothing before, between or after them.
        var bytes = Concat(Header("P6 1 1 255\n", [1, 2, 3]), Header("P6 1 1 255\n", [4, 5, 6]));
        using var stream = new MemoryStream(bytes);

        Assert.Equal(new byte[] { 1, 2, 3 }, NetpbmReader.Read(stream)!.Pixels);
        Assert.Equal(new byte[] { 4, 5, 6 }, NetpbmReader.Read(stream)!.Pixels);
        Assert.Null(NetpbmReader.Read(stream));
    }

    [Theory]
    [InlineData("P3 1 1 255\n")] // plain (ASCII) PPM is not what pdftoppm writes
    [InlineData("P6 1 1\n")] // header cut off
    [InlineData("P6 0 1 255\n")] // no pixels
    [InlineData("P6 1 1 0\n")] // maxval must be above 0
    [InlineData("P6 1 1 70000\n")] // maxval must be below 65536
    [InlineData("P6 1x 1 255\n")] // a number must end with white space
    public void Malformed_headers_are_refused(string header)
    {
        using var stream = new MemoryStream(Header(header, [1, 2, 3]));

        Assert.Throws<InvalidDataException>(() => NetpbmReader.Read(stream));
    }

    [Fact]
    public void A_raster_cut_short_is_refused()
    {
        using var stream = new MemoryStream(Header("P6 2 1 255\n", [1, 2, 3, 4]));

        var error = Assert.Throws<InvalidDataException>(() => NetpbmReader.Read(stream));
        Assert.Contains("ends inside its raster", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Pdftoppm_ppm_read_here_equals_its_png_decoded_by_skia()
    {
        using var folder = new TempFolder();
        var pdf = folder.Write("page.pdf", TestPdfs.Page(300, 200, 0, "0.2 0.5 0.9 rg 20 30 120 80 re f 0 0 0 RG 4 w 150 20 m 280 180 l S"));
        var ppm = RunPdftoppm(pdf);
        var png = RunPdftoppm(pdf, "-png");
        using var stream = new MemoryStream(ppm);
        var ours = NetpbmReader.Read(stream)!;
        using var reference = SKBitmap.Decode(png);
        Assert.Null(NetpbmReader.Read(stream));

        Assert.Equal((reference.Width, reference.Height), (ours.Width, ours.Height));
        for (var y = 0; y < ours.Height; y++)
        {
            for (var x = 0; x < ours.Width; x++)
            {
                var colour = reference.GetPixel(x, y);
                var at = ((y * ours.Width) + x) * 3;
                Assert.Equal((colour.Red, colour.Green, colour.Blue), (ours.Pixels[at], ours.Pixels[at + 1], ours.Pixels[at + 2]));
            }
        }
    }

    private static byte[] RunPdftoppm(string pdf, params string[] options)
    {
        var start = new ProcessStartInfo("pdftoppm") { RedirectStandardOutput = true, UseShellExecute = false };
        foreach (var option in options.Concat(["-r", "72", "-singlefile", pdf]))
        {
            start.ArgumentList.Add(option);
        }

        using var process = Process.Start(start)!;
        using var output = new MemoryStream();
        process.StandardOutput.BaseStream.CopyTo(output);
        process.WaitForExit();
        Assert.Equal(0, process.ExitCode);
        return output.ToArray();
    }

    private static RasterImage Read(string header, byte[] raster)
    {
        using var stream = new MemoryStream(Header(header, raster));
        return NetpbmReader.Read(stream)!;
    }

    private static byte[] Header(string header, byte[] raster) => Concat(System.Text.Encoding.ASCII.GetBytes(header), raster);

    private static byte[] Concat(byte[] a, byte[] b) => [.. a, .. b];
}
