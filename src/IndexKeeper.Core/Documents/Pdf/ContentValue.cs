namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// An operand as it stands in a content stream (ISO 32000-1 §7.3), kept exact: numbers as canonical
/// decimal text, strings as their raw bytes whether written literal or hex.
/// </summary>
internal abstract record ContentValue
{
    private ContentValue()
    {
    }

    public sealed record Number(string Canonical) : ContentValue;

    public sealed record Text(byte[] Bytes) : ContentValue;

    public sealed record Name(string Value) : ContentValue;

    public sealed record Boolean(bool Value) : ContentValue;

    public sealed record Null : ContentValue;

    /// <summary>A bare word where an operand belongs (malformed content); kept so it still counts.</summary>
    public sealed record Keyword(string Value) : ContentValue;

    public sealed record Array(IReadOnlyList<ContentValue> Items) : ContentValue;

    public sealed record Dictionary(IReadOnlyList<KeyValuePair<string, ContentValue>> Entries) : ContentValue;
}
