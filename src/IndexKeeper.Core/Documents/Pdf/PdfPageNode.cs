using UglyToad.PdfPig.Tokens;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// One page found in the page tree, with the attributes it inherits from its ancestors already applied
/// (ISO 32000-1 §7.7.3.4: Resources, MediaBox, CropBox and Rotate are inheritable).
/// </summary>
internal sealed record PdfPageNode(
    DictionaryToken Dictionary,
    DictionaryToken? Resources,
    ArrayToken? MediaBox,
    ArrayToken? CropBox,
    int Rotate);
