using Markdig;

namespace IndexKeeper.Core.Documents.Text;

/// <summary>
/// Reads plain text, Markdown and HTML into text pages (docs/readers.md): each becomes lines of what it
/// shows, laid out by <see cref="TextPageLayout"/>. Markdown is rendered to HTML by Markdig (CommonMark
/// with pipe tables) and read as HTML, so a paragraph re-wrapped in the source keeps its keys.
/// </summary>
internal sealed class TextDocumentReader
{
    private static readonly MarkdownPipeline Markdown = new MarkdownPipelineBuilder().UsePipeTables().Build();

    public DocumentContent Read(byte[] file, DocumentKind kind, ReadLimits limits, CancellationToken cancellationToken)
    {
        if (TextDecoding.LooksBinary(file))
        {
            throw new DocumentReadException(QuarantineReason.Unsupported, $"the file is named as {kind} but holds binary data (NUL bytes)");
        }

        var text = TextDecoding.Decode(file);
        if (kind == DocumentKind.Html)
        {
            var (lines, title) = HtmlText.Read(text);
            return new DocumentContent(kind, TextPageLayout.Paginate(lines, limits.MaxPages, cancellationToken)) { Title = DocumentTitle.Clean(title) };
        }

        return new DocumentContent(kind, TextPageLayout.Paginate(Lines(text, kind), limits.MaxPages, cancellationToken));
    }

    /// <summary>The lines a text of <paramref name="kind"/> shows.</summary>
    public static IEnumerable<string> Lines(string text, DocumentKind kind) => kind switch
    {
        DocumentKind.PlainText => TextDecoding.Lines(text),
        DocumentKind.Markdown => HtmlText.Lines(Markdig.Markdown.ToHtml(text, Markdown)),
        DocumentKind.Html => HtmlText.Lines(text),
        _ => throw new ArgumentOutOfRangeException(nameof(kind), kind, "not a text kind"),
    };
}
