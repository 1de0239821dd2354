using UglyToad.PdfPig.Core;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// Proves, while a page's content is walked, that the form XObjects it draws form no cycle. Two forms
/// that draw each other overflow the parser's stack inside its page loading, which kills the process
/// and cannot be caught; the walk runs before the parser loads the page and stops at the first cycle.
/// Also bounds the nesting depth of forms, which a parser may overflow without any cycle.
/// </summary>
internal sealed class FormGraphCheck
{
    // Producers nest forms a few levels deep; anything beyond this is hostile or broken.
    public const int MaxNesting = 64;

    private readonly List<IndirectReference> drawing = [];

    /// <summary>Marks <paramref name="form"/> as being drawn; throws if it is already on the path.</summary>
    public void Enter(IndirectReference form)
    {
        if (drawing.Contains(form))
        {
            var cycle = string.Join(" -> ", drawing.SkipWhile(r => r != form).Append(form).Select(r => $"{r.ObjectNumber} {r.Generation} R"));
            throw new DocumentReadException(QuarantineReason.Corrupt, $"form XObjects draw each other in a cycle ({cycle})");
        }

        if (drawing.Count == MaxNesting)
        {
            throw new DocumentReadException(QuarantineReason.Corrupt, $"form XObjects nested more than {MaxNesting} deep");
        }

        drawing.Add(form);
    }

    public void Exit(IndirectReference form)
    {
        if (drawing.Count == 0 || drawing[^1] != form)
        {
            throw new InvalidOperationException("form check exited out of order");
        }

        drawing.RemoveAt(drawing.Count - 1);
    }
}
