using System.Diagnostics;
using IndexKeeper.Tests.EndToEnd;

namespace IndexKeeper.Tests.Isolation;

/// <summary>Files built to hurt a reader, each by hand from the structure ISO 32000-1 gives it.</summary>
internal static class HostileFiles
{
    public const string CyclicForms = "cyclic-forms";
    public const string InflationBomb = "inflation-bomb";
    public const string NestedArrays = "nested-arrays";
    public const string RandomBytes = "random-bytes";
    public const string Encrypted = "encrypted";
    public const string ZeroBytes = "zero-bytes";

    /// <summary>Decoded size of the bomb's content stream: far above the cap the tests set.</summary>
    public const int InflatedBytes = 200 * 1024 * 1024;

    // Compressing 200 MB takes a few seconds; build it once per test run.
    private static readonly Lazy<byte[]> Bomb = new(InflatingContentStream);

    public static IReadOnlyList<string> All { get; } = [CyclicForms, InflationBomb, NestedArrays, RandomBytes, Encrypted, ZeroBytes];

    /// <summary>Writes the named file into the folder and returns its path.</summary>
    public static string Write(string name, ScratchFolder folder) => name switch
    {
        CyclicForms => folder.Write(name + ".pdf", FormsThatDrawEachOther()),
        InflationBomb => folder.Write(name + ".pdf", Bomb.Value),
        NestedArrays => folder.Write(name + ".pdf", DeeplyNestedArrays()),
        RandomBytes => folder.Write(name + ".pdf", Random()),
        Encrypted => EncryptedWithQpdf(folder),
        ZeroBytes => folder.Write(name + ".pdf", []),
        _ => throw new ArgumentOutOfRangeException(nameof(name), name, "no such hostile file"),
    };

    /// <summary>
    /// Two form XObjects (ISO 32000-1 §8.10) whose content streams paint each other with the Do operator
    /// (§8.8): the page paints Fa, Fa paints Fb, Fb paints Fa again. Following forms recurses without end.
    /// </summary>
    public static byte[] FormsThatDrawEachOther()
    {
        var pdf = new HandWrittenPdf();
        pdf.Add("<< /Type /Catalog /Pages 2 0 R >>");
        pdf.Add("<< /Type /Pages /Kids [3 0 R] /Count 1 >>");
        pdf.Add("<< /Type /Page /Parent 2 0 R /MediaBox [0 0 612 792] /Resources << /XObject << /Fa 5 0 R >> >> /Contents 4 0 R >>");
        pdf.AddStream(string.Empty, System.Text.Encoding.ASCII.GetBytes("q /Fa Do Q"));
        pdf.AddStream("/Type /XObject /Subtype /Form /BBox [0 0 612 792] /Resources << /XObject << /Fb 6 0 R >> >>", System.Text.Encoding.ASCII.GetBytes("q /Fb Do Q"));
        pdf.AddStream("/Type /XObject /Subtype /Form /BBox [0 0 612 792] /Resources << /XObject << /Fa 5 0 R >> >>", System.Text.Encoding.ASCII.GetBytes("q /Fa Do Q"));
        return pdf.Build();
    }

    /// <summary>
    /// A page whose content stream is FlateDecode-compressed (§7.4.4; the zlib format of RFC 1950/1951)
    /// spaces: a file of about 200 KB that decodes to <see cref="InflatedBytes"/>.
    /// </summary>
    public static byte[] InflatingContentStream() => BadPdfs.InflationBomb(InflatedBytes / (1024 * 1024));

    /// <summary>A page dictionary holding arrays (§7.3.6) nested 100,000 deep.</summary>
    public static byte[] DeeplyNestedArrays()
    {
        const int depth = 100_000;
        var pdf = new HandWrittenPdf();
        pdf.Add("<< /Type /Catalog /Pages 2 0 R >>");
        pdf.Add("<< /Type /Pages /Kids [3 0 R] /Count 1 >>");
        pdf.Add($"<< /Type /Page /Parent 2 0 R /MediaBox [0 0 612 792] /Nest {new string('[', depth)}{new string(']', depth)} /Contents 4 0 R >>");
        pdf.AddStream(string.Empty, System.Text.Encoding.ASCII.GetBytes("0 0 m 100 100 l S"));
        return pdf.Build();
    }

    /// <summary>64 KiB of seeded pseudo-random bytes: no PDF header (§7.5.2), no structure at all.</summary>
    public static byte[] Random()
    {
        var bytes = new byte[64 * 1024];
        new Random(20_240_611).NextBytes(bytes);
        return bytes;
    }

    /// <summary>A good PDF encrypted by qpdf (Debian package) with AES-256 (§7.6) and a user password.</summary>
    public static string EncryptedWithQpdf(ScratchFolder folder)
    {
        var plain = folder.Write("plain-for-encryption.pdf", GoodFiles.InspectionPdf());
        var encrypted = folder.File(Encrypted + ".pdf");
        var qpdf = Process.Start(new ProcessStartInfo("qpdf", ["--encrypt", "inspector", "owner", "256", "--", plain, encrypted])
        {
            RedirectStandardError = true,
        }) ?? throw new InvalidOperationException("cannot start qpdf");
        var errors = qpdf.StandardError.ReadToEnd();
        qpdf.WaitForExit();
        Assert.True(qpdf.ExitCode == 0, $"qpdf --encrypt failed: {errors}");
        return encrypted;
    }
}
