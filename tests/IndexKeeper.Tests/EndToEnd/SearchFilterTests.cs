using System.Text.Json;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// Filters and paging of <c>search</c> on the real executable (issue 13): roots, folder globs, types,
/// modified-since, minimum score, offset with <c>nextOffset</c>; a filter naming an unknown root or a
/// malformed date is exit 2 naming it; a query whose words are on no page finds nothing, filtered or not.
/// The file system's own modification times are the reference for modified-since.
/// </summary>
public sealed class SearchFilterTests : IDisposable
{
    private readonly CliIndex index = new("plant", "office");

    public SearchFilterTests()
    {
        index.Put("plant/reports/weir.pdf", StorePdfs.Document("weir", 2, 1, "Kestrel weir inspection report"));
        index.Put("plant/notes/weir.txt", System.Text.Encoding.UTF8.GetBytes("Kestrel weir notes taken at dawn\n"));
        var old = index.Put("office/budget.pdf", StorePdfs.Document("budget", 2, 2, "Kestrel weir budget"));
        File.SetLastWriteTimeUtc(old, new DateTime(2020, 1, 6, 0, 0, 0, DateTimeKind.Utc));
        index.Json("sync");
    }

    public void Dispose() => index.Dispose();

    [Fact]
    public void Each_filter_keeps_only_the_documents_it_names()
    {
        Assert.Equal(["office/budget.pdf", "plant/notes/weir.txt", "plant/reports/weir.pdf"], Found());
        Assert.Equal(["office/budget.pdf"], Found("--in-root", "office"));
        Assert.Equal(["plant/reports/weir.pdf"], Found("--in-folder", "reports"));
        Assert.Equal(["plant/notes/weir.txt", "plant/reports/weir.pdf"], Found("--in-folder", "*/weir.*"));
        Assert.Equal(["plant/notes/weir.txt"], Found("--type", "plaintext"));
        Assert.Equal(["office/budget.pdf", "plant/reports/weir.pdf"], Found("--type", "pdf"));
        Assert.Equal(["plant/notes/weir.txt", "plant/reports/weir.pdf"], Found("--modified-since", "2024-01-01"));
        Assert.Equal(["plant/reports/weir.pdf"], Found("--in-root", "plant", "--type", "pdf", "--modified-since", "2024-01-01T00:00:00Z"));
        Assert.Empty(Found("--min-score", "1000"));
        Assert.Empty(Found("--in-root", "plant", "--type", "png"));
    }

    [Fact]
    public void Pages_of_hits_follow_the_ranking_and_say_where_the_next_starts()
    {
        var all = Hits(index.Json("search", "kestrel weir", "-k", "10"));
        Assert.True(all.Count >= 4, string.Join(", ", all));
        var first = index.Json("search", "kestrel weir", "-k", "2");
        var second = index.Json("search", "kestrel weir", "-k", "2", "--offset", "2");
        Assert.Equal(all.Take(2), Hits(first));
        Assert.Equal(2, first.GetProperty("nextOffset").GetInt32());
        Assert.Equal(all.Skip(2).Take(2), Hits(second));
        Assert.Equal(2, second.GetProperty("offset").GetInt32());

        var past = index.Json("search", "kestrel weir", "-k", "2", "--offset", "40");
        Assert.Empty(Hits(past));
        Assert.Equal(JsonValueKind.Null, past.GetProperty("nextOffset").ValueKind);
    }

    [Theory]
    [InlineData("--in-root", "nowhere", "root 'nowhere'")]
    [InlineData("--modified-since", "2026-02-30", "modified-since '2026-02-30'")]
    [InlineData("--modified-since", "yesterday", "modified-since 'yesterday'")]
    [InlineData("--type", "scroll", "type 'scroll'")]
    [InlineData("--offset", "many", "offset 'many'")]
    public void A_bad_filter_is_exit_2_naming_it(string option, string value, string named)
    {
        var result = index.Run("search", "kestrel weir", option, value);
        Assert.Equal(2, result.ExitCode);
        Assert.Contains(named, result.Stderr, StringComparison.Ordinal);
    }

    [Fact]
    public void Words_on_no_page_find_nothing_with_or_without_a_filter()
    {
        Assert.Empty(Hits(index.Json("search", "zqxv blorft")));
        Assert.Empty(Hits(index.Json("search", "zqxv blorft", "--in-root", "plant")));
    }

    private List<string> Found(params string[] filter) =>
        [.. index.Json("search", ["kestrel weir", "-k", "10", .. filter]).GetProperty("hits").EnumerateArray()
            .Select(h => h.GetProperty("root").GetString() + "/" + h.GetProperty("path").GetString()).Distinct().Order(StringComparer.Ordinal)];

    private static List<string> Hits(JsonElement report) =>
        [.. report.GetProperty("hits").EnumerateArray().Select(h => h.GetProperty("pageKey").GetString()!)];
}
