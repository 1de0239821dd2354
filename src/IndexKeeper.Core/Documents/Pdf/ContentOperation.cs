namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// One operator of a content stream with its operands. For an inline image (BI … ID … EI) the operator
/// is "BI", the operands are empty, and <see cref="ImageDictionary"/>/<see cref="ImageData"/> hold the image.
/// </summary>
internal sealed record ContentOperation(
    string Operator,
    IReadOnlyList<ContentValue> Operands,
    ContentValue.Dictionary? ImageDictionary = null,
    byte[]? ImageData = null);
