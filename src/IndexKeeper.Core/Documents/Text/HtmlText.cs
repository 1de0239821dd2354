using System.Text;
using AngleSharp.Dom;
using AngleSharp.Html.Parser;

namespace IndexKeeper.Core.Documents.Text;

/// <summary>
/// The text an HTML page shows, as lines (docs/readers.md, "HTML"): parsed as a browser would (AngleSharp,
/// WHATWG HTML), scripts, styles, templates and hidden elements dropped, white space collapsed as CSS
/// does outside <c>pre</c>, block elements on lines of their own, list items marked, table cells joined
/// with " | ". Styling does not show in a text page, so only text and line structure decide the key.
/// </summary>
internal static class HtmlText
{
    private static readonly HashSet<string> Skipped = new(StringComparer.OrdinalIgnoreCase)
    {
        "script", "style", "template", "noscript", "head", "title", "iframe", "object", "svg", "math",
    };

    private static readonly HashSet<string> Blocks = new(StringComparer.OrdinalIgnoreCase)
    {
        "address", "article", "aside", "blockquote", "body", "dd", "details", "dialog", "div", "dl", "dt",
        "fieldset", "figcaption", "figure", "footer", "form", "h1", "h2", "h3", "h4", "h5", "h6", "header",
        "hr", "li", "main", "nav", "ol", "p", "pre", "section", "summary", "table", "tr", "ul", "caption",
    };

    /// <summary>Blocks followed by an empty line, as browsers leave a margin after them.</summary>
    private static readonly HashSet<string> Spaced = new(StringComparer.OrdinalIgnoreCase)
    {
        "p", "h1", "h2", "h3", "h4", "h5", "h6", "pre", "blockquote", "table", "ul", "ol", "dl", "hr",
    };

    public static List<string> Lines(string html) => Read(html).Lines;

    /// <summary>The lines the page shows and its <c>title</c> element (not shown on the page; null when absent).</summary>
    public static (List<string> Lines, string? Title) Read(string html)
    {
        var document = new HtmlParser().ParseDocument(html);
        var writer = new LineWriter();
        if (document.Body is { } body)
        {
            Walk(body, writer, preformatted: false);
        }

        return (writer.Finish(), document.Title);
    }

    private static void Walk(INode node, LineWriter writer, bool preformatted)
    {
        foreach (var child in node.ChildNodes)
        {
            switch (child)
            {
                case IText text:
                    writer.Text(text.Data, preformatted);
                    break;
                case IElement element when Skipped.Contains(element.LocalName) || element.HasAttribute("hidden"):
                    break;
                case IElement { LocalName: "br" }:
                    writer.Break();
                    break;
                case IElement element:
                    Element(element, writer, preformatted);
                    break;
            }
        }
    }

    private static void Element(IElement element, LineWriter writer, bool preformatted)
    {
        var name = element.LocalName;
        var block = Blocks.Contains(name);
        if (block)
        {
            writer.Break();
        }

        if (name is "li")
        {
            writer.Text(element.ParentElement?.LocalName == "ol" ? Ordinal(element) + ". " : "• ", preformatted: true);
        }
        else if (name is "td" or "th" && element.PreviousElementSibling is not null)
        {
            writer.Text(" | ", preformatted: true);
        }
        else if (name is "hr")
        {
            writer.Text("———", preformatted: true);
        }

        Walk(element, writer, preformatted || name is "pre" or "textarea");
        if (block)
        {
            writer.Break();
            if (Spaced.Contains(name))
            {
                writer.BlankLine();
            }
        }
    }

    private static string Ordinal(IElement item)
    {
        var start = int.TryParse(item.ParentElement?.GetAttribute("start"), out var s) ? s : 1;
        var index = item.ParentElement!.Children.Where(c => c.LocalName == "li").ToList().IndexOf(item);
        return (start + index).ToString(System.Globalization.CultureInfo.InvariantCulture);
    }

    /// <summary>Collects text into lines: white space collapsed outside pre, at most one empty line in a row.</summary>
    private sealed class LineWriter
    {
        private readonly List<string> lines = [];
        private readonly StringBuilder current = new();
        private bool pendingSpace;

        public void Text(string text, bool preformatted)
        {
            if (preformatted)
            {
                var parts = text.ReplaceLineEndings("\n").Split('\n');
                for (var i = 0; i < parts.Length; i++)
                {
                    if (i > 0)
                    {
                        Break(force: true);
                    }

                    Flush();
                    current.Append(parts[i]);
                }

                return;
            }

            foreach (var c in text)
            {
                if (char.IsWhiteSpace(c))
                {
                    pendingSpace = current.Length > 0;
                }
                else
                {
                    Flush();
                    current.Append(c);
                }
            }
        }

        public void Break() => Break(force: false);

        public void BlankLine()
        {
            Break();
            if (lines.Count > 0 && lines[^1].Length > 0)
            {
                lines.Add(string.Empty);
            }
        }

        public List<string> Finish()
        {
            Break();
            while (lines.Count > 0 && lines[^1].Length == 0)
            {
                lines.RemoveAt(lines.Count - 1);
            }

            return lines;
        }

        private void Break(bool force)
        {
            if (current.Length > 0 || force)
            {
                lines.Add(current.ToString());
                current.Clear();
            }

            pendingSpace = false;
        }

        private void Flush()
        {
            if (pendingSpace)
            {
                current.Append(' ');
                pendingSpace = false;
            }
        }
    }
}
