using System.Globalization;
using System.Security.Cryptography;
using UglyToad.PdfPig;

namespace IndexKeeper.Tests.Demo;

/// <summary>
/// What each page of a demo file shows, as PdfPig reads it back: page size and rotation, every content
/// operation as PdfPig writes it, and the bytes of every image. Object numbers and document metadata are
/// left out. Good enough to compare files from the demo's own builder with each other; the index's real
/// page key is another component's work. Image files are keyed on their bytes.
/// </summary>
internal static class PageSignatures
{
    public static IReadOnlyList<string> Of(string path)
    {
        string extension = Path.GetExtension(path).ToLowerInvariant();
        if (extension != ".pdf")
        {
            return [Convert.ToHexString(SHA256.HashData(File.ReadAllBytes(path)))];
        }

        using var document = PdfDocument.Open(path);
        var signatures = new List<string>();
        foreach (var page in document.GetPages())
        {
            using var canonical = new MemoryStream();
            var header = string.Create(CultureInfo.InvariantCulture, $"{page.Width} {page.Height} {page.Rotation.Value}\n");
            canonical.Write(System.Text.Encoding.ASCII.GetBytes(header));
            foreach (var operation in page.Operations)
            {
                operation.Write(canonical);
            }

            foreach (var image in page.GetImages())
            {
                canonical.Write(image.RawBytes);
            }

            signatures.Add(Convert.ToHexString(SHA256.HashData(canonical.ToArray())));
        }

        return signatures;
    }
}
