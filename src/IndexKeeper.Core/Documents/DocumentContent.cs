namespace IndexKeeper.Core.Documents;

/// <summary>The result of reading one document: its kind and its pages in order.</summary>
public sealed record DocumentContent(DocumentKind Kind, IReadOnlyList<PageContent> Pages);
