namespace IndexKeeper.Core.Documents;

/// <summary>
/// What the readers can give beyond a file's bytes, numbered (docs/readers.md, "Reader version"). Each
/// document records the number it was read under, so a build whose readers give more reads again, once,
/// the documents an older build could not read fully: quarantined ones, and live ones with a page
/// without words. Documents recorded before the number existed read as 0. Never reuse a number.
/// </summary>
public static class ReaderVersion
{
    /// <summary>
    /// 1: PDF text layers; image pages without words. 2: office, OpenDocument and text-like files; OCR of
    /// pages without a text layer, whose keys are salted with the OCR identity.
    /// </summary>
    public const int Current = 2;
}
