namespace IndexKeeper.Core.Documents;

/// <summary>
/// The reader's external programs and the bounds of conversion, OCR and e-mail parts (docs/readers.md).
/// The supervisor hands them to its worker process at start (docs/reader-worker.md, "Settings").
/// </summary>
/// <param name="OfficeConverter">LibreOffice's <c>soffice</c>: a path, or a name looked up on PATH.</param>
/// <param name="ConversionTimeout">Cap on one conversion; the read's own timeout also applies.</param>
/// <param name="ConversionMemoryBytes">Address-space cap of the converter process (Linux, through <c>prlimit</c>); null: none.</param>
/// <param name="Ocr">Whether pages without a text layer are read by Tesseract.</param>
/// <param name="OcrProgram">Tesseract: a path or a name on PATH.</param>
/// <param name="OcrLanguages">Tesseract language packs, joined with '+' on its command line (Debian: tesseract-ocr-LANG).</param>
/// <param name="OcrPageTimeout">Cap on the OCR of one page; the read's own timeout also applies.</param>
/// <param name="Rasterizer">poppler's <c>pdftoppm</c>, which draws PDF pages for OCR.</param>
/// <param name="OcrCacheDirectory">Where OCR words are kept by page key (<c>OcrCache</c>); null: no cache.</param>
/// <param name="MaxNestingDepth">Messages attached to messages, at most this deep.</param>
/// <param name="MaxParts">Attachments of one e-mail, all levels together, at most this many.</param>
public sealed record ReaderSettings(
    string OfficeConverter,
    TimeSpan ConversionTimeout,
    long? ConversionMemoryBytes,
    bool Ocr,
    string OcrProgram,
    IReadOnlyList<string> OcrLanguages,
    TimeSpan OcrPageTimeout,
    string Rasterizer,
    string? OcrCacheDirectory,
    int MaxNestingDepth,
    int MaxParts)
{
    public static ReaderSettings Default { get; } = new(
        OfficeConverter: "soffice",
        ConversionTimeout: TimeSpan.FromSeconds(50),
        ConversionMemoryBytes: 4L * 1024 * 1024 * 1024,
        Ocr: true,
        OcrProgram: "tesseract",
        OcrLanguages: ["eng"],
        OcrPageTimeout: TimeSpan.FromSeconds(30),
        Rasterizer: "pdftoppm",
        OcrCacheDirectory: null,
        MaxNestingDepth: 8,
        MaxParts: 64);
}
