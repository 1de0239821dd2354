using System.Globalization;
using System.Text;
using IndexKeeper.Core.Documents.Tools;
using IndexKeeper.Tests.Readers;
using MimeKit;
using SkiaSharp;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// The documents the reader benchmark reads, made for it: office files by DocumentFormat.OpenXml (the
/// tests' samples) and LibreOffice's own conversions of them, text-like files in our invented harbour
/// scenario, and scans drawn from a real text PDF of Debian's documentation.
/// </summary>
internal static class ReaderSamples
{
    /// <summary>
    /// The GNU Libtasn1 manual of Debian's libtasn1-doc package (installed by ./install): real typeset
    /// pages, drawn at 300 dpi as a scanner would deliver them.
    /// </summary>
    public const string DebianManual = "/usr/share/doc/libtasn1-doc/libtasn1.pdf";

    private const int ScanDpi = 300;

    /// <summary>Office files by format (extension without the dot), <paramref name="copies"/> of each.</summary>
    public static Dictionary<string, List<string>> Office(string folder, int copies)
    {
        Directory.CreateDirectory(folder);
        var made = new Dictionary<string, List<string>>(StringComparer.Ordinal)
        {
            ["docx"] = Write(folder, "report-{0}.docx", copies, i => OfficeSamples.Report(pages: 8, seed: i)),
            ["xlsx"] = Write(folder, "fees-{0}.xlsx", copies, i => OfficeSamples.Workbook(rows: (uint)(240 + i))),
            ["pptx"] = Write(folder, "quay-{0}.pptx", copies, _ => OfficeSamples.Deck(12)),
        };

        // The OpenDocument, RTF and legacy binary files are LibreOffice's own saves of the same documents.
        foreach (var (from, to) in new[] { ("docx", "odt"), ("docx", "rtf"), ("docx", "doc"), ("xlsx", "ods"), ("xlsx", "xls"), ("pptx", "odp"), ("pptx", "ppt") })
        {
            made[to] = ConvertAll(made[from], to, Path.Combine(folder, to));
        }

        return made;
    }

    /// <summary>Plain text, Markdown, HTML and e-mail files, <paramref name="copies"/> of each, about seven text pages apiece.</summary>
    public static Dictionary<string, List<string>> Text(string folder, int copies)
    {
        Directory.CreateDirectory(folder);
        return new Dictionary<string, List<string>>(StringComparer.Ordinal)
        {
            ["txt"] = Write(folder, "log-{0}.txt", copies, i => Encoding.UTF8.GetBytes(string.Join('\n', Lines(i)))),
            ["md"] = Write(folder, "log-{0}.md", copies, i => Encoding.UTF8.GetBytes(
                $"# Harbour log {i}\n\n" + string.Join("\n\n", Lines(i).Chunk(5).Select(c => "- " + string.Join("\n- ", c))))),
            ["html"] = Write(folder, "log-{0}.html", copies, i => Encoding.UTF8.GetBytes(
                $"<!doctype html><html><head><title>Log {i}</title><style>p{{margin:0}}</style></head><body><h1>Harbour log {i}</h1>"
                + string.Concat(Lines(i).Select(l => "<p>" + l + "</p>")) + "</body></html>")),
            ["eml"] = Write(folder, "log-{0}.eml", copies, Email),
        };
    }

    /// <summary>
    /// Scans without a text layer: image-only PDFs of two pages, PNG and TIFF pages, <paramref name="copies"/>
    /// of each, drawn from pages 5 onwards of <see cref="DebianManual"/>.
    /// </summary>
    public static Dictionary<string, List<string>> Scans(string folder, int copies)
    {
        if (!File.Exists(DebianManual))
        {
            throw new InvalidOperationException($"{DebianManual} is missing: run ./install (Debian package libtasn1-doc)");
        }

        Directory.CreateDirectory(folder);
        var drawn = Enumerable.Range(0, 2 * copies).Select(i => File.ReadAllBytes(Draw(folder, 5 + i))).ToList();
        return new Dictionary<string, List<string>>(StringComparer.Ordinal)
        {
            ["scanned pdf"] = Write(folder, "scan-{0}.pdf", copies, i => ImageOnlyPdf(drawn[2 * i], drawn[(2 * i) + 1])),
            ["png"] = Write(folder, "scan-{0}.png", copies, i => drawn[i]),
            ["tiff"] = Write(folder, "scan-{0}.tif", copies, i => Tiff(drawn[i])),
        };
    }

    private static List<string> Write(string folder, string pattern, int copies, Func<int, byte[]> make) =>
        Enumerable.Range(0, copies).Select(i =>
        {
            var path = Path.Combine(folder, string.Format(CultureInfo.InvariantCulture, pattern, i));
            File.WriteAllBytes(path, make(i));
            return path;
        }).ToList();

    /// <summary>LibreOffice's own save of each file in another format, one soffice run for all of them.</summary>
    private static List<string> ConvertAll(List<string> sources, string format, string output)
    {
        var profile = new Uri(Path.Combine(output, "profile")).AbsoluteUri;
        var run = ToolRunner.Run(
            "soffice",
            ["--headless", "--norestore", "-env:UserInstallation=" + profile, "--convert-to", format, "--outdir", output, .. sources],
            TimeSpan.FromMinutes(10),
            memoryBytes: null,
            maxOutputBytes: 1 << 20,
            CancellationToken.None);
        var converted = sources.Select(s => Path.Combine(output, Path.GetFileNameWithoutExtension(s) + "." + format)).ToList();
        return run.ExitCode == 0 && converted.All(File.Exists)
            ? converted
            : throw new InvalidOperationException($"soffice could not save the samples as {format}: exit code {run.ExitCode}, {run.ErrorHead}");
    }

    private static IEnumerable<string> Lines(int seed) => Enumerable.Range(1, 400).Select(line =>
        $"{seed % 28 + 1:D2} Apr 08:{line % 60:D2}  berth {(seed + line) % 24 + 1}: vessel KH-{(seed * 37 + line * 11) % 900 + 100} moored, "
        + $"draught {(line % 7) + 5}.{seed % 10} m, pilot {(line % 3 == 0 ? "Okafor" : "Pennock")}, tide {(line * 13) % 60} min after high water");

    /// <summary>A message whose body is the log, with the first part of it attached as a text file.</summary>
    private static byte[] Email(int seed)
    {
        var message = new MimeMessage { Subject = "Harbour log " + seed, Date = new DateTimeOffset(2025, 4, 2, 8, 30, 0, TimeSpan.Zero) };
        message.From.Add(new MailboxAddress("Harbour office", "office@kellmarsh-harbour.example"));
        message.To.Add(new MailboxAddress("Pilots", "pilots@kellmarsh-harbour.example"));
        var lines = Lines(seed).ToList();
        message.Body = new Multipart("mixed")
        {
            new TextPart("plain") { Text = string.Join('\n', lines.Take(300)) },
            new MimePart("text", "plain")
            {
                Content = new MimeContent(new MemoryStream(Encoding.UTF8.GetBytes(string.Join('\n', lines.Skip(300))))),
                ContentDisposition = new ContentDisposition(ContentDisposition.Attachment),
                ContentTransferEncoding = ContentEncoding.Base64,
                FileName = "late-arrivals.txt",
            },
        };
        using var stream = new MemoryStream();
        message.WriteTo(stream);
        return stream.ToArray();
    }

    /// <summary>Page <paramref name="page"/> of the manual drawn by poppler's pdftoppm at 300 dpi, in grey, as PNG.</summary>
    private static string Draw(string folder, int page)
    {
        var number = page.ToString(CultureInfo.InvariantCulture);
        var prefix = Path.Combine(folder, "manual-page-" + number);
        var run = ToolRunner.Run(
            "pdftoppm",
            ["-r", ScanDpi.ToString(CultureInfo.InvariantCulture), "-gray", "-png", "-singlefile", "-f", number, "-l", number, DebianManual, prefix],
            TimeSpan.FromMinutes(2),
            memoryBytes: null,
            maxOutputBytes: 1 << 20,
            CancellationToken.None);
        return run.ExitCode == 0 ? prefix + ".png" : throw new InvalidOperationException($"pdftoppm failed on page {page}: {run.ErrorHead}");
    }

    /// <summary>A PDF whose pages are only the given 300 dpi images (SkiaSharp's PDF backend): no text layer.</summary>
    private static byte[] ImageOnlyPdf(params byte[][] pngs)
    {
        using var stream = new MemoryStream();
        using (var document = SKDocument.CreatePdf(stream))
        {
            foreach (var png in pngs)
            {
                using var bitmap = SKBitmap.Decode(png);
                var width = bitmap.Width * 72f / ScanDpi;
                var height = bitmap.Height * 72f / ScanDpi;
                document.BeginPage(width, height).DrawBitmap(bitmap, new SKRect(0, 0, width, height));
                document.EndPage();
            }
        }

        return stream.ToArray();
    }

    private static byte[] Tiff(byte[] png)
    {
        using var image = SixLabors.ImageSharp.Image.Load(png);
        using var stream = new MemoryStream();
        SixLabors.ImageSharp.ImageExtensions.SaveAsTiff(image, stream);
        return stream.ToArray();
    }
}
