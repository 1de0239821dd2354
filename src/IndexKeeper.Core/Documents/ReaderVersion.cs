namespace IndexKeeper.Core.Documents;

/// <summary>
/// The version of the reading rules beyond the page-key form: which files become pages and how (office
/// conversion, text pagination, e-mail parts) and where words come from (text layer or OCR, and the OCR
/// rule). A page read under an older version may lack words or pages the current rules give, so the
/// version is recorded with what was read and a change is planned as re-read work (docs/readers.md).
/// </summary>
public static class ReaderVersion
{
    /// <summary>
    /// 1: PDF, PNG, JPEG, TIFF with the PDF text layer. 2: office and OpenDocument files through LibreOffice,
    /// text-like files, e-mail, OCR of pages without a text layer. Never reuse a number.
    /// </summary>
    public const int Current = 2;
}
