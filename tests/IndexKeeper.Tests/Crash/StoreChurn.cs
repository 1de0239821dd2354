using System.Globalization;
using UglyToad.PdfPig.Content;
using UglyToad.PdfPig.Core;
using UglyToad.PdfPig.Fonts.Standard14Fonts;
using UglyToad.PdfPig.Writer;

namespace IndexKeeper.Tests.Crash;

/// <summary>
/// Changes a document store between crash rounds the way people do (invented content of our demo
/// scenario): rewrites a PDF with new pages, deletes a document, copies one into another folder, adds a
/// new report. Every new page carries made-up words found nowhere else, so a search can find it.
/// </summary>
internal sealed class StoreChurn(string root, int seed)
{
    private static readonly string[] Syllables = ["brae", "cul", "dun", "fen", "gill", "holm", "ket", "lyn", "mere", "nab", "ock", "pell", "quar", "rigg", "scar", "thwa", "ulls", "vat", "wyke", "yar"];
    private readonly Random random = new(seed);
    private int made;

    /// <summary>A phrase that only the last new page holds, with the document and 1-based page that hold it.</summary>
    public (string Phrase, string RelativePath, int Page)? LastUnique { get; private set; }

    /// <summary>Applies one random change and says what it was.</summary>
    public string Step()
    {
        var documents = Directory.EnumerateFiles(root, "*", SearchOption.AllDirectories).Order(StringComparer.Ordinal).ToList();
        switch (random.Next(4))
        {
            case 0:
                var edited = Pick(documents, ".pdf");
                WriteReport(edited);
                return "rewrote " + Relative(edited);
            case 1:
                var deleted = Pick(documents, null);
                File.Delete(deleted);
                return "deleted " + Relative(deleted);
            case 2:
                var copied = Pick(documents, null);
                var target = Path.Combine(root, "copies", made++.ToString(CultureInfo.InvariantCulture) + "-" + Path.GetFileName(copied));
                Directory.CreateDirectory(Path.GetDirectoryName(target)!);
                File.Copy(copied, target);
                return "copied " + Relative(copied) + " to " + Relative(target);
            default:
                return Add();
        }
    }

    /// <summary>Adds a new field note (of 2 to 5 pages when <paramref name="pages"/> is 0); <see cref="LastUnique"/> then names its last page.</summary>
    public string Add(int pages = 0)
    {
        var added = Path.Combine(root, "reports", "churn", $"HWA-CR-{made++:000} field note.pdf");
        Directory.CreateDirectory(Path.GetDirectoryName(added)!);
        WriteReport(added, pages);
        return "added " + Relative(added);
    }

    private string Pick(List<string> documents, string? extension)
    {
        var candidates = documents.Where(d => extension is null || d.EndsWith(extension, StringComparison.OrdinalIgnoreCase)).ToList();
        return candidates[random.Next(candidates.Count)];
    }

    /// <summary>A new report of <paramref name="pages"/> pages, or 2 to 5 when 0.</summary>
    private void WriteReport(string path, int pages = 0)
    {
        pages = pages > 0 ? pages : random.Next(2, 6);
        using var builder = new PdfDocumentBuilder();
        var font = builder.AddStandard14Font(Standard14Font.Helvetica);
        for (var p = 1; p <= pages; p++)
        {
            var page = builder.AddPage(PageSize.A4);
            page.AddText("Harrowmere Water Authority field note", 14, new PdfPoint(72, 780), font);
            var phrase = $"{Word()} {Word()} {Word()}";
            page.AddText(phrase, 12, new PdfPoint(72, 750), font);
            for (var line = 0; line < 18; line++)
            {
                page.AddText($"Observation {line + 1}: {Word()} sluice {Word()} level {random.Next(1000)} millimetres", 10, new PdfPoint(72, 720 - (line * 14)), font);
            }

            LastUnique = (phrase, Relative(path), p);
        }

        File.WriteAllBytes(path, builder.Build());
    }

    /// <summary>Three of 20 syllables: 8,000 made-up words, so three of them together mark one page.</summary>
    private string Word() =>
        Syllables[random.Next(Syllables.Length)] + Syllables[random.Next(Syllables.Length)] + Syllables[random.Next(Syllables.Length)];

    private string Relative(string path) => Path.GetRelativePath(root, path).Replace(Path.DirectorySeparatorChar, '/');
}
