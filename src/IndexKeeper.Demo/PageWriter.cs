using UglyToad.PdfPig.Core;
using UglyToad.PdfPig.Graphics.Operations;
using UglyToad.PdfPig.Graphics.Operations.TextObjects;
using UglyToad.PdfPig.Graphics.Operations.TextPositioning;
using UglyToad.PdfPig.Graphics.Operations.TextShowing;
using UglyToad.PdfPig.Graphics.Operations.TextState;
using UglyToad.PdfPig.Tokens;
using UglyToad.PdfPig.Writer;

namespace IndexKeeper.Demo;

/// <summary>Drawing helpers over one page of the PDF builder: text with wrapping, lines, shapes, images.
/// Coordinates are PDF points from the bottom-left corner; text cursors move downwards.</summary>
internal sealed class PageWriter
{
    public const double Margin = 56;

    private readonly PdfPageBuilder page;
    private readonly Dictionary<PdfDocumentBuilder.AddedFont, NameToken> fontNames = [];

    public PageWriter(PdfPageBuilder page, DemoFonts fonts)
    {
        this.page = page;
        Fonts = fonts;
    }

    public DemoFonts Fonts { get; }

    public double Width => page.PageSize.Width;

    public double Height => page.PageSize.Height;

    public double Top => Height - Margin;

    public double Bottom => Margin;

    public double ContentWidth => Width - 2 * Margin;

    /// <summary>
    /// Writes the same operations as the builder's AddText, which lays out every letter and costs about
    /// 12 µs per character: too slow for hundreds of pages. The first text in each font on a page still
    /// goes through AddText, which puts the font into the page's resources; its resource name is read
    /// back from the operation it wrote.
    /// </summary>
    public void Text(string text, double x, double y, double size, PdfDocumentBuilder.AddedFont? font = null)
    {
        var used = font ?? Fonts.Regular;
        Fonts.Measure(text, used, size);
        var operations = page.CurrentStream.Operations;
        if (!fontNames.TryGetValue(used, out var name))
        {
            page.AddText(text, size, new PdfPoint(x, y), used);
            fontNames[used] = operations.OfType<SetFontAndSize>().Last().Font;
            return;
        }

        operations.Add(BeginText.Value);
        operations.Add(new SetFontAndSize(name, size));
        operations.Add(new MoveToNextLineWithOffset(x, y));
        AddWords(operations, text);
        operations.Add(EndText.Value);
    }

    /// <summary>One show-text operation per word, a word's leading space included, as AddText writes them.
    /// The text is printable ASCII (checked by measuring it), which the standard encoding maps to itself.</summary>
    private static void AddWords(List<IGraphicsStateOperation> operations, string text)
    {
        int start = 0;
        for (int at = 0; at < text.Length; at++)
        {
            if (text[at] == ' ')
            {
                operations.Add(new ShowText(System.Text.Encoding.ASCII.GetBytes(text[start..at])));
                start = at;
            }
        }

        if (start < text.Length)
        {
            operations.Add(new ShowText(System.Text.Encoding.ASCII.GetBytes(text[start..])));
        }
    }

    public void TextRight(string text, double right, double y, double size, PdfDocumentBuilder.AddedFont? font = null)
    {
        var used = font ?? Fonts.Regular;
        Text(text, right - TextWidth(text, used, size), y, size, used);
    }

    public void TextCentred(string text, double centre, double y, double size, PdfDocumentBuilder.AddedFont? font = null)
    {
        var used = font ?? Fonts.Regular;
        Text(text, centre - TextWidth(text, used, size) / 2, y, size, used);
    }

    public double TextWidth(string text, PdfDocumentBuilder.AddedFont font, double size) => Fonts.Measure(text, font, size);

    /// <summary>Greedy line breaking on spaces; a word longer than the width stands on its own line.</summary>
    public IReadOnlyList<string> Wrap(string text, double width, double size, PdfDocumentBuilder.AddedFont font)
    {
        var lines = new List<string>();
        string current = "";
        foreach (string word in text.Split(' ', StringSplitOptions.RemoveEmptyEntries))
        {
            string candidate = current.Length == 0 ? word : current + " " + word;
            if (current.Length > 0 && TextWidth(candidate, font, size) > width)
            {
                lines.Add(current);
                current = word;
            }
            else
            {
                current = candidate;
            }
        }

        if (current.Length > 0)
        {
            lines.Add(current);
        }

        return lines;
    }

    /// <summary>Draws already wrapped lines from baseline <paramref name="y"/> down; returns the next baseline.</summary>
    public double Lines(IReadOnlyList<string> lines, double x, double y, double size, PdfDocumentBuilder.AddedFont font, double leading)
    {
        foreach (string line in lines)
        {
            Text(line, x, y, size, font);
            y -= leading;
        }

        return y;
    }

    public void Line(double x1, double y1, double x2, double y2, double width = 0.75) =>
        page.DrawLine(new PdfPoint(x1, y1), new PdfPoint(x2, y2), width);

    public void Rectangle(double x, double y, double width, double height, double lineWidth = 0.75, bool fill = false) =>
        page.DrawRectangle(new PdfPoint(x, y), width, height, lineWidth, fill);

    public void Circle(double centreX, double centreY, double diameter, double lineWidth = 0.75, bool fill = false) =>
        page.DrawCircle(new PdfPoint(centreX, centreY), diameter, lineWidth, fill);

    public void Triangle(double x1, double y1, double x2, double y2, double x3, double y3, double lineWidth = 0.75, bool fill = false) =>
        page.DrawTriangle(new PdfPoint(x1, y1), new PdfPoint(x2, y2), new PdfPoint(x3, y3), lineWidth, fill);

    public void StrokeColour(byte red, byte green, byte blue) => page.SetStrokeColor(red, green, blue);

    public void FillColour(byte red, byte green, byte blue) => page.SetTextAndFillColor(red, green, blue);

    /// <summary>Back to black strokes and fills.</summary>
    public void ResetColour() => page.ResetColor();

    public void Png(byte[] png, double x, double y, double width, double height) =>
        page.AddPng(png, new PdfRectangle(x, y, x + width, y + height));

    public void Jpeg(byte[] jpeg, double x, double y, double width, double height) =>
        page.AddJpeg(jpeg, new PdfRectangle(x, y, x + width, y + height));

    /// <summary>Header rule with two labels and a footer rule with two labels, the frame of most pages.</summary>
    public void Furniture(string headerLeft, string headerRight, string footerLeft, string footerRight)
    {
        StrokeColour(40, 80, 120);
        Line(Margin, Height - 40, Width - Margin, Height - 40, 1);
        Line(Margin, 40, Width - Margin, 40, 0.5);
        ResetColour();
        Text(headerLeft, Margin, Height - 34, 8, Fonts.Bold);
        TextRight(headerRight, Width - Margin, Height - 34, 8);
        Text(footerLeft, Margin, 28, 8);
        TextRight(footerRight, Width - Margin, 28, 8, Fonts.Bold);
    }
}
