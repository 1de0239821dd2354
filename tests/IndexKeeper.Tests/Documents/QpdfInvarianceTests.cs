namespace IndexKeeper.Tests.Documents;

/// <summary>
/// Page keys must survive every qpdf rewrite that keeps what pages show (Debian's qpdf, the independent
/// tool named by the issue). Run on a PdfPig-builder document and on the hand-written one that uses forms,
/// ExtGState, embedded fonts, predictors, inline images, split contents and annotations.
/// </summary>
public sealed class QpdfInvarianceTests : IDisposable
{
    private readonly TempFolder folder = new();

    public static TheoryData<string, string> Rewrites()
    {
        var data = new TheoryData<string, string>();
        string[][] transforms =
        [
            [],
            ["--object-streams=generate"],
            ["--linearize"],
            ["--stream-data=uncompress"],
            ["--compress-streams=n"],
            ["--pages", "{in}", "1-z", "--"],
            ["--object-streams=generate", "--stream-data=compress", "--recompress-flate", "--compression-level=1"],
            ["--qdf"],
            ["--normalize-content=y"],
            ["--coalesce-contents"],
            ["--externalize-inline-images", "--ii-min-bytes=0"],
            ["--remove-unreferenced-resources=yes"],
            ["--decode-level=specialized"],
        ];
        foreach (var document in new[] { "builder", "rich" })
        {
            foreach (var transform in transforms)
            {
                data.Add(document, string.Join('\u001f', transform));
            }
        }

        return data;
    }

    [Theory]
    [MemberData(nameof(Rewrites))]
    public void Rewrite_keeps_every_page_key(string document, string transform)
    {
        var original = Document(document);
        var rewritten = Qpdf.Rewrite(folder, original, transform.Length == 0 ? [] : transform.Split('\u001f'));
        Assert.NotEqual(original, rewritten);
        Assert.Equal(folder.Keys(original), folder.Keys(rewritten));
    }

    [Theory]
    [InlineData("builder")]
    [InlineData("rich")]
    public void Reorder_moves_the_keys_with_their_pages(string document)
    {
        var original = Document(document);
        var keys = folder.Keys(original);

        // qpdf 11.3 reads "--pages in.pdf 2-z 1 --" with "1" as a file name; "2-z,1" is one range list.
        var reordered = folder.Keys(Qpdf.Rewrite(folder, original, "--pages", "{in}", "2-z,1", "--"));
        Assert.Equal(keys.Skip(1).Append(keys[0]), reordered);
    }

    [Theory]
    [InlineData("builder")]
    [InlineData("rich")]
    public void Deleting_a_page_keeps_the_other_keys(string document)
    {
        var original = Document(document);
        var keys = folder.Keys(original);
        var remaining = folder.Keys(Qpdf.Rewrite(folder, original, "--pages", "{in}", "1,3-z", "--"));
        Assert.Equal(keys.Where((_, i) => i != 1), remaining);
    }

    [Fact]
    public void Keys_of_the_sample_documents_are_distinct_per_page()
    {
        // Guards the tests above: equal lists of identical keys would prove nothing.
        foreach (var document in new[] { "builder", "rich" })
        {
            var keys = folder.Keys(Document(document));
            Assert.Equal(keys.Count, keys.Distinct().Count());
        }
    }

    public void Dispose() => folder.Dispose();

    private static byte[] Document(string name) => name == "builder" ? SampleDocuments.Builder(4) : SampleDocuments.Rich();
}
