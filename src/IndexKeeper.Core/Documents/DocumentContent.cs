namespace IndexKeeper.Core.Documents;

/// <summary>The result of reading one document: its kind and its pages in order.</summary>
public sealed record DocumentContent(DocumentKind Kind, IReadOnlyList<PageContent> Pages)
{
    /// <summary>
    /// The title the document gives itself, cleaned by <see cref="DocumentTitle.Clean"/>: a PDF's document
    /// information Title (ISO 32000-1 §14.3.3; an office file's through the PDF it was drawn as), an HTML
    /// page's <c>title</c> element, an e-mail's Subject. Null when it gives none.
    /// </summary>
    public string? Title { get; init; }
}
