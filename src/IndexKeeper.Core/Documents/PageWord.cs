namespace IndexKeeper.Core.Documents;

/// <summary>One word of a page's text and the box it occupies; text encoders keep the box per vector.</summary>
public sealed record PageWord(string Text, PageBox Box);
