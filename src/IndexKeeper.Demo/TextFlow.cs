namespace IndexKeeper.Demo;

/// <summary>A top-to-bottom text cursor on one page: draws headings and paragraphs while they fit, between
/// the page's margins.</summary>
internal sealed class TextFlow(PageWriter page, double top)
{
    private const double BodySize = 10;
    private const double BodyLeading = 13.5;
    private const double Left = PageWriter.Margin;

    /// <summary>Top of the space not yet used.</summary>
    public double Y { get; private set; } = top;

    public double Remaining => Y - page.Bottom;

    public void Space(double points) => Y -= points;

    public void MoveTo(double y) => Y = y;

    public void Heading(string text, double size)
    {
        Y -= size;
        page.Text(text, Left, Y, size, page.Fonts.Bold);
        Y -= size * 0.6;
    }

    /// <summary>Draws the paragraph if all of it fits above the bottom margin; returns whether it did.</summary>
    public bool Paragraph(string text, double indent = 0)
    {
        var lines = page.Wrap(text, page.ContentWidth - indent, BodySize, page.Fonts.Regular);
        double height = lines.Count * BodyLeading;
        if (height > Remaining)
        {
            return false;
        }

        page.Lines(lines, Left + indent, Y - BodySize, BodySize, page.Fonts.Regular, BodyLeading);
        Y -= height + BodyLeading * 0.5;
        return true;
    }

    /// <summary>A numbered item with a hanging indent; returns whether it fitted.</summary>
    public bool Numbered(string number, string text)
    {
        const double Indent = 22;
        var lines = page.Wrap(text, page.ContentWidth - Indent, BodySize, page.Fonts.Regular);
        double height = lines.Count * BodyLeading;
        if (height > Remaining)
        {
            return false;
        }

        page.Text(number, Left, Y - BodySize, BodySize, page.Fonts.Bold);
        page.Lines(lines, Left + Indent, Y - BodySize, BodySize, page.Fonts.Regular, BodyLeading);
        Y -= height + 3;
        return true;
    }

    /// <summary>A ruled box with a bold label and wrapped text, as for warnings and notes.</summary>
    public bool Boxed(string label, string text, byte red, byte green, byte blue)
    {
        var lines = page.Wrap(text, page.ContentWidth - 20, BodySize, page.Fonts.Regular);
        double height = lines.Count * BodyLeading + 28;
        if (height > Remaining)
        {
            return false;
        }

        page.FillColour(red, green, blue);
        page.Rectangle(Left, Y - height, page.ContentWidth, height, 1.2, fill: true);
        page.ResetColour();
        page.Text(label, Left + 10, Y - 15, 10, page.Fonts.Bold);
        page.Lines(lines, Left + 10, Y - 30, BodySize, page.Fonts.Regular, BodyLeading);
        Y -= height + 8;
        return true;
    }
}
