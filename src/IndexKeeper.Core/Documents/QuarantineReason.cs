namespace IndexKeeper.Core.Documents;

/// <summary>Why a document could not be read. Numbers reach the catalog: never change them.</summary>
public enum QuarantineReason
{
    Corrupt = 1,
    Encrypted = 2,
    Unsupported = 3,
    TooLarge = 4,
    TooManyPages = 5,
    ReadTimeout = 6,
    ReaderCrashed = 7,
    DecodedStreamTooLarge = 8,
    Unreadable = 9,

    /// <summary>The reader ran out of memory (its worker process has a heap cap) reading this document.</summary>
    ReaderOutOfMemory = 10,

    /// <summary>A program the reader needs for this kind (LibreOffice, Tesseract, pdftoppm) is not installed.</summary>
    ToolMissing = 11,

    /// <summary>An e-mail nests messages deeper, or carries more parts, than the reader's bounds.</summary>
    TooManyParts = 12,

    /// <summary>The converter (LibreOffice) or the OCR program failed on this document.</summary>
    ConversionFailed = 13,
}
