namespace IndexKeeper.Service.Configuration;

/// <summary>
/// The reader's converters and OCR (docs/readers.md): which programs, which OCR languages, and how long and
/// how large one conversion or one page's OCR may get. A missing program quarantines the files that need
/// it with a reason naming the Debian package; it does not stop the start.
/// </summary>
public sealed class ReaderOptions
{
    /// <summary>Whether pages without a text layer (scans, photos) are read by Tesseract.</summary>
    public bool Ocr { get; set; } = true;

    /// <summary>
    /// Tesseract languages, e.g. <c>eng</c>, <c>deu</c>, <c>chi_sim</c> (Debian ships each as tesseract-ocr-LANG);
    /// empty takes English. A list the configuration binder would append to, so the default lives apart.
    /// </summary>
    public List<string> OcrLanguages { get; set; } = [];

    public double OcrPageTimeoutSeconds { get; set; } = 30;

    /// <summary>LibreOffice's <c>soffice</c>: a path, or a name looked up on PATH.</summary>
    public string OfficeConverter { get; set; } = "soffice";

    /// <summary>Tesseract: a path, or a name looked up on PATH.</summary>
    public string OcrProgram { get; set; } = "tesseract";

    public double ConversionTimeoutSeconds { get; set; } = 50;

    /// <summary>Address-space cap of one LibreOffice conversion (Linux).</summary>
    public long ConversionMemoryMegabytes { get; set; } = 4096;

    /// <summary>Messages attached to messages, at most this deep.</summary>
    public int MaxEmailNesting { get; set; } = 8;

    /// <summary>Attachments of one e-mail, all levels together, at most this many.</summary>
    public int MaxEmailAttachments { get; set; } = 64;

    /// <summary>The languages in force: the configured ones, or <c>eng</c> when none are.</summary>
    public IReadOnlyList<string> EffectiveOcrLanguages => OcrLanguages.Count > 0 ? OcrLanguages : ["eng"];
}
