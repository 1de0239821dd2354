using System.Globalization;
using IndexKeeper.Tests.Documents;

namespace IndexKeeper.Tests.Encoding.PageImages;

/// <summary>One-page PDFs written by hand (ISO 32000-1 §7.7.3.3 page objects: /MediaBox, /Rotate, /Contents).</summary>
internal static class TestPdfs
{
    /// <summary>A page of <paramref name="width"/>×<paramref name="height"/> points drawing <paramref name="content"/> (§8 graphics operators).</summary>
    public static byte[] Page(int width, int height, int rotate, string content) => Pages(Enumerable.Repeat((width, height, rotate, content), 1).ToArray());

    public static byte[] Pages(params (int Width, int Height, int Rotate, string Content)[] pages)
    {
        var pdf = new HandWrittenPdf();
        var catalog = pdf.Reserve();
        var tree = pdf.Reserve();
        var kids = new List<int>();
        foreach (var (width, height, rotate, content) in pages)
        {
            var stream = pdf.AddStream(string.Empty, HandWrittenPdf.Latin1(content));
            kids.Add(pdf.Add(string.Create(
                CultureInfo.InvariantCulture,
                $"<< /Type /Page /Parent {tree} 0 R /MediaBox [0 0 {width} {height}] /Rotate {rotate} /Contents {stream} 0 R /Resources << >> >>")));
        }

        pdf.Set(tree, $"<< /Type /Pages /Kids [{string.Join(" ", kids.Select(k => $"{k} 0 R"))}] /Count {kids.Count} >>");
        pdf.Set(catalog, $"<< /Type /Catalog /Pages {tree} 0 R >>");
        return pdf.Build(catalog);
    }
}
