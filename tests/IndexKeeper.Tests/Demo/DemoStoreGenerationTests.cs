using System.Text.RegularExpressions;
using IndexKeeper.Demo;
using SkiaSharp;
using UglyToad.PdfPig;

namespace IndexKeeper.Tests.Demo;

[Collection(DemoStoreCollection.Name)]
public sealed partial class DemoStoreGenerationTests(DemoStoreFixture store)
{
    private IEnumerable<DemoDocument> Pdfs => store.First.Documents.Where(document => document.RelativePath.EndsWith(".pdf", StringComparison.Ordinal));

    [Fact]
    public void Two_generations_are_byte_identical()
    {
        Assert.Equal(store.FirstHashes.Keys.Order(StringComparer.Ordinal), store.SecondHashesBefore.Keys.Order(StringComparer.Ordinal));
        foreach (var (path, hash) in store.FirstHashes)
        {
            Assert.True(hash == store.SecondHashesBefore[path], $"{path} differs between two generations");
        }
    }

    [Fact]
    public void Another_seed_gives_other_bytes()
    {
        var usual = StorePlan.Create(2026).Files();
        var other = StorePlan.Create(7).Files();
        Assert.Equal(usual.Select(file => file.StorePath), other.Select(file => file.StorePath));
        int form = usual.ToList().FindIndex(file => file.RelativePath.StartsWith("inspections/", StringComparison.Ordinal));
        Assert.NotEqual(usual[form].Build(), other[form].Build());
    }

    [Fact]
    public void The_store_has_the_promised_size_and_lists_every_file()
    {
        Assert.InRange(store.First.DocumentCount, 30, 40);
        Assert.InRange(store.First.PageCount, 400, 600);
        Assert.Equal(["field-scans", "shared-drive"], store.First.Roots.Select(root => root.Name).Order(StringComparer.Ordinal));
        var listed = store.First.Documents.Select(document => document.Root + "/" + document.RelativePath).ToHashSet();
        var onDisk = store.FirstHashes.Keys.Where(path => path != DemoManifest.FileName).ToHashSet();
        Assert.Equal(onDisk.Order(StringComparer.Ordinal), listed.Order(StringComparer.Ordinal));
        foreach (var root in store.First.Roots)
        {
            Assert.True(Directory.Exists(root.Path), root.Path);
        }
    }

    [Fact]
    public void Manuals_have_20_to_60_pages_forms_1_to_2_reports_3_to_8()
    {
        Assert.All(store.First.Documents.Where(document => document.RelativePath.StartsWith("manuals/", StringComparison.Ordinal)), document => Assert.InRange(document.PageCount, 20, 60));
        Assert.All(store.First.Documents.Where(document => document.RelativePath.StartsWith("inspections/", StringComparison.Ordinal)), document => Assert.InRange(document.PageCount, 1, 2));
        Assert.All(store.First.Documents.Where(document => document.RelativePath.StartsWith("reports/", StringComparison.Ordinal)), document => Assert.InRange(document.PageCount, 3, 8));
        Assert.Contains(store.First.Documents, document => document.RelativePath.StartsWith("drawings/", StringComparison.Ordinal));
    }

    [Fact]
    public void Every_pdf_passes_qpdf_check()
    {
        foreach (var document in Pdfs)
        {
            // qpdf manual, "Exit Status": 0 means no errors or warnings (2 errors, 3 warnings).
            var (exitCode, output) = ExternalTool.Run("qpdf", "--check", PathOf(document));
            Assert.True(exitCode == 0, $"{document.RelativePath}: qpdf --check exit {exitCode}\n{output}");
        }
    }

    [Fact]
    public void Pdfinfo_counts_the_pages_the_generator_reports()
    {
        foreach (var document in Pdfs)
        {
            Assert.Equal(document.PageCount, ExternalTool.PdfinfoPageCount(PathOf(document)));
        }
    }

    [Fact]
    public void PdfPig_reads_every_page_with_its_text()
    {
        int pngImages = 0;
        int jpegImages = 0;
        foreach (var document in Pdfs)
        {
            using var pdf = PdfDocument.Open(PathOf(document));
            Assert.Equal(document.PageCount, pdf.NumberOfPages);
            foreach (var page in pdf.GetPages())
            {
                Assert.False(string.IsNullOrWhiteSpace(page.Text), $"{document.RelativePath} page {page.Number} has no text");
                foreach (var image in page.GetImages())
                {
                    var filter = image.ImageDictionary.Data.TryGetValue("Filter", out var token) ? token.ToString() : "";
                    if (filter!.Contains("DCTDecode", StringComparison.Ordinal))
                    {
                        jpegImages++;
                    }
                    else if (filter.Contains("FlateDecode", StringComparison.Ordinal))
                    {
                        pngImages++;
                    }
                }
            }
        }

        Assert.True(pngImages > 0, "no embedded PNG (Flate) image");
        Assert.True(jpegImages > 0, "no embedded JPEG image");
    }

    [Fact]
    public void Png_and_jpeg_scans_decode_at_a4_100_dpi()
    {
        var scans = store.First.Documents.Where(document => document.RelativePath.EndsWith(".png", StringComparison.Ordinal) || document.RelativePath.EndsWith(".jpg", StringComparison.Ordinal)).ToList();
        Assert.Contains(scans, scan => scan.RelativePath.EndsWith(".png", StringComparison.Ordinal));
        Assert.Contains(scans, scan => scan.RelativePath.EndsWith(".jpg", StringComparison.Ordinal));
        foreach (var scan in scans)
        {
            using var bitmap = SKBitmap.Decode(PathOf(scan));
            Assert.NotNull(bitmap);
            // A4 is 210 x 297 mm (ISO 216): 827 x 1169 pixels at 100 dots per inch.
            Assert.Equal(827, bitmap.Width);
            Assert.Equal(1169, bitmap.Height);
        }
    }

    [Fact]
    public void The_tiff_has_one_directory_per_page_per_libtiff()
    {
        var tiff = Assert.Single(store.First.Documents, document => document.RelativePath.EndsWith(".tif", StringComparison.Ordinal));
        // libtiff-tools' tiffinfo prints one "TIFF Directory at offset" block per image (TIFF 6.0 IFD).
        var (exitCode, output) = ExternalTool.Run("tiffinfo", PathOf(tiff));
        Assert.True(exitCode == 0, output);
        Assert.Equal(tiff.PageCount, DirectoryLine().Matches(output).Count);
        Assert.Equal(tiff.PageCount, SizeLine().Matches(output).Count);
        Assert.True(tiff.PageCount > 1);
    }

    [Fact]
    public void No_two_pages_of_the_store_show_the_same()
    {
        var all = store.SignaturesBefore.Values.SelectMany(pages => pages).ToList();
        Assert.Equal(all.Count, all.Distinct().Count());
    }

    [Fact]
    public void Generate_refuses_a_directory_that_is_not_empty()
    {
        string directory = Path.Combine(Path.GetTempPath(), "indexkeeper-demo-full-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(directory);
        try
        {
            File.WriteAllText(Path.Combine(directory, "keep.txt"), "mine");
            Assert.Throws<IOException>(() => DemoStore.Generate(directory));
            Assert.Equal("mine", File.ReadAllText(Path.Combine(directory, "keep.txt")));
            Assert.Single(Directory.EnumerateFileSystemEntries(directory));
        }
        finally
        {
            Directory.Delete(directory, recursive: true);
        }
    }

    private string PathOf(DemoDocument document) => DemoStoreFixture.FullPath(store.FirstDirectory, document.Root + "/" + document.RelativePath);

    [GeneratedRegex("TIFF Directory at offset")]
    private static partial Regex DirectoryLine();

    [GeneratedRegex(@"Image Width: 827 Image Length: 1169")]
    private static partial Regex SizeLine();
}
