using IndexKeeper.Core.Documents;
using IndexKeeper.Tests.Documents;

namespace IndexKeeper.Tests.Readers;

public sealed class TextReaderTests : IDisposable
{
    private readonly TempFolder folder = new();

    private const string Notice = "Kellmarsh harbour notice\n\nThe eastern quay closes for dredging\tfrom 3 May.\nPilots report to berth 4.\n";

    [Fact]
    public void Line_ends_byte_order_mark_and_trailing_spaces_do_not_change_keys()
    {
        var plain = Keys("notice.txt", System.Text.Encoding.UTF8.GetBytes(Notice));
        Assert.Equal(plain, Keys("crlf.txt", System.Text.Encoding.UTF8.GetBytes(Notice.ReplaceLineEndings("\r\n"))));
        Assert.Equal(plain, Keys("bom.txt", [0xEF, 0xBB, 0xBF, .. System.Text.Encoding.UTF8.GetBytes(Notice)]));
        Assert.Equal(plain, Keys("utf16.txt", [0xFF, 0xFE, .. System.Text.Encoding.Unicode.GetBytes(Notice)]));
        Assert.Equal(plain, Keys("spaces.txt", System.Text.Encoding.UTF8.GetBytes(Notice.Replace("\n", "   \n", StringComparison.Ordinal) + "\n\n\n")));
        Assert.NotEqual(plain, Keys("edited.txt", System.Text.Encoding.UTF8.GetBytes(Notice.Replace("berth 4", "berth 5", StringComparison.Ordinal))));
    }

    [Fact]
    public void Pages_hold_sixty_lines_and_long_lines_wrap_at_one_hundred_columns()
    {
        var lines = Enumerable.Range(1, 130).Select(i => "Line " + i).ToList();
        lines[0] = string.Join(' ', Enumerable.Repeat("dredging", 30));
        var content = Read("long.txt", System.Text.Encoding.UTF8.GetBytes(string.Join('\n', lines)));

        // 130 lines, the first wrapped into 3 (30 words of 9 columns: 11 to a line): 132 lines → 60 + 60 + 12.
        Assert.Equal(3, content.Pages.Count);
        Assert.Equal(DocumentKind.PlainText, content.Kind);
        Assert.Equal("Line 58", content.Pages[0].Words[^2].Text + " " + content.Pages[0].Words[^1].Text);
        Assert.All(content.Pages.SelectMany(p => p.Words), w => Assert.InRange(w.Box.Right, 0, 595));
    }

    [Fact]
    public void A_form_feed_starts_a_new_page()
    {
        Assert.Equal(2, Read("ff.txt", "first page\fsecond page"u8.ToArray()).Pages.Count);
    }

    [Fact]
    public void Markdown_paragraphs_rewrapped_in_the_source_keep_their_keys()
    {
        var one = Keys("a.markdown", "# Dredging\n\nThe eastern quay closes\nfrom 3 May.\n\n- berth 4\n- berth 5\n"u8.ToArray());
        var two = Keys("b.markdown", "Dredging\n========\n\nThe eastern quay\ncloses from 3 May.\n\n* berth 4\n* berth 5\n"u8.ToArray());
        Assert.Equal(one, two);
        var content = Read("c.markdown", "# Dredging\n\n| Berth | Fee |\n|---|---|\n| 4 | 37 |\n"u8.ToArray());
        Assert.Equal(DocumentKind.Markdown, content.Kind);
        Assert.Contains(content.Pages[0].Words, w => w.Text == "Fee");
    }

    [Fact]
    public void Html_whitespace_scripts_and_styles_do_not_change_keys()
    {
        var one = Keys("a.html", "<html><head><title>x</title><style>p{color:red}</style></head><body><h1>Dredging</h1><p>The eastern   quay\ncloses.</p><script>var a=1;</script></body></html>"u8.ToArray());
        var two = Keys("b.htm", "<!DOCTYPE html><html><body>\n  <h1>Dredging</h1>\n  <p>The eastern quay closes.</p>\n</body></html>"u8.ToArray());
        Assert.Equal(one, two);
        Assert.NotEqual(one, Keys("c.html", "<h1>Dredging</h1><p>The western quay closes.</p>"u8.ToArray()));
    }

    [Fact]
    public void A_binary_file_named_as_text_is_unsupported()
    {
        var path = folder.Write("image.txt", [0x00, 0x01, 0x02, 0x00]);
        var failure = Assert.Throws<DocumentReadException>(() => DocumentReaderFactory.Create().Read(path, ReadLimits.Default, CancellationToken.None));
        Assert.Equal(QuarantineReason.Unsupported, failure.Reason);
    }

    public void Dispose() => folder.Dispose();

    private DocumentContent Read(string name, byte[] bytes) =>
        DocumentReaderFactory.Create().Read(folder.Write(name, bytes), ReadLimits.Default, CancellationToken.None);

    private List<PageKey> Keys(string name, byte[] bytes) => Read(name, bytes).Pages.Select(p => p.Key).ToList();
}
