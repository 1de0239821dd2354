using System.Text.RegularExpressions;
using IndexKeeper.Core.Documents;

namespace IndexKeeper.Service.Configuration;

/// <summary>Maps the <c>Readers</c> section onto the reader worker's settings, and names its problems for the validator.</summary>
internal static partial class ReaderSetup
{
    /// <summary>The OCR cache's folder inside the index directory (docs/readers.md, "OCR cache").</summary>
    public const string OcrCacheFolder = "ocr-cache";

    public static ReaderSettings Settings(ReaderOptions readers, string indexDirectory) => new(
        OfficeConverter: readers.OfficeConverter,
        ConversionTimeout: TimeSpan.FromSeconds(readers.ConversionTimeoutSeconds),
        ConversionMemoryBytes: readers.ConversionMemoryMegabytes * 1024 * 1024,
        Ocr: readers.Ocr,
        OcrProgram: readers.OcrProgram,
        OcrLanguages: [.. readers.EffectiveOcrLanguages],
        OcrPageTimeout: TimeSpan.FromSeconds(readers.OcrPageTimeoutSeconds),
        Rasterizer: ReaderSettings.Default.Rasterizer,
        OcrCacheDirectory: Path.Combine(Path.GetFullPath(indexDirectory), OcrCacheFolder),
        MaxNestingDepth: readers.MaxEmailNesting,
        MaxParts: readers.MaxEmailAttachments);

    /// <summary>What is wrong with the languages and programs, each naming its setting (ranges are the validator's).</summary>
    public static IEnumerable<string> Problems(ReaderOptions readers)
    {
        for (var i = 0; i < readers.OcrLanguages.Count; i++)
        {
            // Tesseract joins languages with '+' on its command line: a name must not smuggle in another.
            if (!Language().IsMatch(readers.OcrLanguages[i] ?? string.Empty))
            {
                yield return $"Readers:OcrLanguages:{i}: '{readers.OcrLanguages[i]}' is not a Tesseract language name; use letters, digits and '_' (e.g. eng, chi_sim) or script/NAME.";
            }
        }

        foreach (var (name, program) in new[] { ("Readers:OfficeConverter", readers.OfficeConverter), ("Readers:OcrProgram", readers.OcrProgram) })
        {
            if (string.IsNullOrWhiteSpace(program))
            {
                yield return $"{name}: must name a program (a path or a name on PATH).";
            }
        }
    }

    [GeneratedRegex("^(script/)?[A-Za-z0-9_]{1,40}$")]
    private static partial Regex Language();
}
