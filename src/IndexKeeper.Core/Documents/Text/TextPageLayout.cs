using System.Text;
using IndexKeeper.Core.Documents.Pdf;
using TextEncoding = System.Text.Encoding;

namespace IndexKeeper.Core.Documents.Text;

/// <summary>
/// The text page rule (docs/readers.md, "Text pages"): lines of text are cleaned, wrapped at
/// <see cref="Columns"/> and cut into pages of <see cref="LinesPerPage"/> lines on an A4 grid; each page's key
/// hashes its lines (docs/page-keys.md, "Text pages") and each word gets the box of its grid cells.
/// </summary>
internal static class TextPageLayout
{
    /// <summary>Version of this rule, hashed into every text page key. Never reuse a number.</summary>
    public const uint Rule = 1;

    public const int Columns = 100;
    public const int LinesPerPage = 60;
    public const int TabWidth = 8;

    /// <summary>A4 (ISO 216) in PDF points.</summary>
    public const float PageWidth = 595f;
    public const float PageHeight = 842f;
    public const float CellWidth = 4.8f;
    public const float LineHeight = 12f;
    private const float LeftMargin = (PageWidth - (Columns * CellWidth)) / 2;
    private const float TopMargin = (PageHeight - (LinesPerPage * LineHeight)) / 2;

    /// <summary>The form feed starts a new page (as printers have long done with it, common practice).</summary>
    public const char PageBreak = '\f';

    /// <summary>Lays out <paramref name="lines"/> (without line ends; <see cref="PageBreak"/> may appear alone on a line).</summary>
    public static IReadOnlyList<PageContent> Paginate(IEnumerable<string> lines, int maxPages, CancellationToken cancellationToken)
    {
        var pages = new List<List<string>> { new() };
        foreach (var raw in lines)
        {
            cancellationToken.ThrowIfCancellationRequested();
            var segments = raw.Split(PageBreak);
            for (var s = 0; s < segments.Length; s++)
            {
                if (s > 0)
                {
                    pages.Add([]);
                }

                if (s > 0 && segments[s].Length == 0 && s == segments.Length - 1)
                {
                    continue;
                }

                foreach (var line in Wrap(Clean(segments[s])))
                {
                    if (pages[^1].Count == LinesPerPage)
                    {
                        pages.Add([]);
                    }

                    pages[^1].Add(line);
                }

                if (pages.Count > maxPages)
                {
                    throw new DocumentReadException(QuarantineReason.TooManyPages, $"more than the limit of {maxPages} pages of text");
                }
            }
        }

        // Blank lines at the end of a page show nothing, nor does an empty page at the end of the text.
        foreach (var page in pages)
        {
            while (page.Count > 0 && page[^1].Length == 0)
            {
                page.RemoveAt(page.Count - 1);
            }
        }

        while (pages.Count > 1 && pages[^1].Count == 0)
        {
            pages.RemoveAt(pages.Count - 1);
        }

        return pages.Select((page, i) => new PageContent(i + 1, Key(page), PageWidth, PageHeight, 0, Words(page))).ToList();
    }

    /// <summary>NFC, tabs expanded, control characters and trailing white space removed.</summary>
    internal static string Clean(string line)
    {
        var text = line.Normalize(NormalizationForm.FormC);
        var cleaned = new StringBuilder(text.Length);
        foreach (var c in text)
        {
            if (c == '\t')
            {
                cleaned.Append(' ', TabWidth - (cleaned.Length % TabWidth));
            }
            else if (!char.IsControl(c) && c != '\uFEFF')
            {
                cleaned.Append(c);
            }
        }

        return cleaned.ToString().TrimEnd();
    }

    /// <summary>Cuts a line into pieces of at most <see cref="Columns"/> characters, at the last space when there is one.</summary>
    internal static IEnumerable<string> Wrap(string line)
    {
        while (line.Length > Columns)
        {
            var cut = line.LastIndexOf(' ', Columns);
            if (cut <= 0)
            {
                cut = Columns;
            }

            yield return line[..cut].TrimEnd();
            line = line[cut..].TrimStart(' ');
        }

        yield return line;
    }

    private static PageKey Key(List<string> lines)
    {
        var writer = new CanonicalWriter();
        writer.Raw(PageKeyFormat.Magic);
        writer.UInt32(PageKeyFormat.Version);
        writer.Byte(PageKeyFormat.TextPage);
        writer.UInt32(Rule);
        writer.UInt32((uint)lines.Count);
        foreach (var line in lines)
        {
            writer.String(TextEncoding.UTF8.GetBytes(line));
        }

        return PageKey.Of(writer.WrittenSpan);
    }

    private static List<PageWord> Words(List<string> lines)
    {
        var words = new List<PageWord>();
        for (var row = 0; row < lines.Count; row++)
        {
            var line = lines[row];
            var top = PageHeight - TopMargin - (row * LineHeight);
            var column = 0;
            while (column < line.Length)
            {
                if (line[column] == ' ')
                {
                    column++;
                    continue;
                }

                var end = line.IndexOf(' ', column);
                end = end < 0 ? line.Length : end;
                var left = LeftMargin + (column * CellWidth);
                words.Add(new PageWord(line[column..end], new PageBox(left, top - LineHeight, left + ((end - column) * CellWidth), top)));
                column = end;
            }
        }

        return words;
    }
}
