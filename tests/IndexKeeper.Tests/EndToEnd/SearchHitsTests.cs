namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// What a search answer gives a retrieval pipeline (issue 13), on the real executable: the page's words
/// around the match with the matched words marked, the document's facts as the file system states them, no
/// hits for a query whose words appear nowhere, and a serving view the sync left that the search maps
/// without writing it.
/// </summary>
public sealed class SearchHitsTests : IDisposable
{
    private const string Line = "Reservoir spillway inspected after the northern storm";
    private readonly CliIndex index = new("store");

    public void Dispose() => index.Dispose();

    [Fact]
    public void A_hit_carries_its_snippet_and_document_facts_and_nonsense_finds_nothing()
    {
        var file = index.Put("store/logs/spillway.pdf", StorePdfs.Document("spillway", 4, 3, Line));
        index.Json("sync");
        var view = Directory.GetFiles(index.PathOf("index/serving"), "*.view").Single();
        var written = File.ReadAllBytes(view);

        var search = index.Json("search", "spillway storm", "-k", "3");
        var top = search.GetProperty("hits").EnumerateArray().First();
        Assert.Equal(3, top.GetProperty("page").GetInt32());
        var snippet = top.GetProperty("snippet").GetString()!;
        Assert.Contains("«spillway»", snippet, StringComparison.Ordinal);
        Assert.Contains("«storm»", snippet, StringComparison.Ordinal);
        Assert.Contains("inspected", snippet, StringComparison.Ordinal);

        // The file system's own account of the file is the reference for the document facts.
        var facts = new FileInfo(file);
        Assert.Equal(facts.Length, top.GetProperty("documentSize").GetInt64());
        Assert.Equal(facts.LastWriteTimeUtc, top.GetProperty("documentModifiedUtc").GetDateTime().ToUniversalTime());
        Assert.Equal("Pdf", top.GetProperty("documentKind").GetString());

        var nonsense = index.Json("search", "qzxvwk jjfpqh", "-k", "3");
        Assert.Empty(nonsense.GetProperty("hits").EnumerateArray());

        // Reads never write: the view the sync wrote is mapped as it is.
        Assert.Equal(written, File.ReadAllBytes(view));
    }

    [Fact]
    public void Maps_of_an_earlier_search_are_replaced_and_nothing_else_in_the_folder_is_touched()
    {
        index.Put("store/logs/spillway.pdf", StorePdfs.Document("spillway", 4, 3, Line));
        index.Json("sync");
        var maps = index.PathOf("maps");
        Directory.CreateDirectory(maps);
        File.WriteAllText(Path.Combine(maps, "01-keep-p1.png"), "the operator's own file");

        index.Json("search", "spillway storm", "-k", "3", "--maps", maps);
        var first = Directory.GetFiles(maps, "*.png").Select(Path.GetFileName).ToHashSet();
        index.Json("search", "spillway storm", "-k", "1", "--maps", maps);
        var second = Directory.GetFiles(maps, "*.png").Select(Path.GetFileName).ToHashSet();

        // Three maps, then one: the two the second search did not write are gone, the operator's file stays.
        Assert.Equal(4, first.Count);
        Assert.Equal(2, second.Count);
        Assert.Contains("01-keep-p1.png", second);
        Assert.Equal("the operator's own file", File.ReadAllText(Path.Combine(maps, "01-keep-p1.png")));
        Assert.Equal(second.Where(n => n != "01-keep-p1.png"), File.ReadAllLines(Path.Combine(maps, ".indexkeeper-maps")));
    }

    [Fact]
    public void A_hit_carries_the_title_its_document_gives_itself()
    {
        index.Put("store/logs/rota.html", System.Text.Encoding.UTF8.GetBytes(
            "<!doctype html><html><head><title>Spillway gate rota</title></head><body><p>Pilot rota for the spillway gate crews</p></body></html>"));
        index.Put("store/logs/spillway.pdf", StorePdfs.Document("spillway", 2, 1, Line));
        index.Json("sync");

        var titled = index.Json("search", "pilot rota crews", "-k", "1").GetProperty("hits").EnumerateArray().Single();
        var untitled = index.Json("search", "reservoir inspected northern", "-k", "1").GetProperty("hits").EnumerateArray().Single();

        Assert.Equal(("logs/rota.html", "Spillway gate rota"), (titled.GetProperty("path").GetString(), titled.GetProperty("documentTitle").GetString()));
        Assert.Equal("logs/spillway.pdf", untitled.GetProperty("path").GetString());
        Assert.True(!untitled.TryGetProperty("documentTitle", out var none) || none.ValueKind == System.Text.Json.JsonValueKind.Null);
    }
}
