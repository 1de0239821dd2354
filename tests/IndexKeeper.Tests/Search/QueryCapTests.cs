using System.Net;
using System.Text.Json;
using IndexKeeper.Tests.Daemon;
using IndexKeeper.Tests.EndToEnd;

namespace IndexKeeper.Tests.Search;

/// <summary>
/// A query's length, its number of terms and k have caps (Query:MaxCharacters, Query:MaxTerms,
/// Query:MaxResults): past them the answer is a clear error naming the setting, exit 2 on the command
/// line and HTTP 400 from the API, never a huge answer. One query is one <c>q</c>.
/// </summary>
public sealed class QueryCapTests
{
    [Fact]
    public void TheCommandRefusesQueriesPastTheCapsWithExit2()
    {
        using var index = new CliIndex("store");
        index.Put("store/sluice-log.pdf", StorePdfs.Document("Weirgate", 2));
        index.Json("sync");

        var tooLong = index.Run("search", new string('w', 1001));
        Assert.True(tooLong.ExitCode == 2, tooLong.Stdout + tooLong.Stderr);
        Assert.Contains("Query:MaxCharacters", tooLong.Stderr, StringComparison.Ordinal);
        Assert.Empty(tooLong.Stdout);

        var manyTerms = index.Run("search", string.Join(' ', Enumerable.Range(0, 33).Select(i => "sluice" + i)));
        Assert.True(manyTerms.ExitCode == 2, manyTerms.Stdout + manyTerms.Stderr);
        Assert.Contains("Query:MaxTerms", manyTerms.Stderr, StringComparison.Ordinal);

        var bigK = index.Run("search", "Weirgate register", "-k", "101");
        Assert.True(bigK.ExitCode == 2, bigK.Stdout + bigK.Stderr);
        Assert.Contains("Query:MaxResults", bigK.Stderr, StringComparison.Ordinal);

        // At the caps the query is answered; a raised cap lets a larger one through.
        var atCaps = index.Json("search", string.Join(' ', Enumerable.Range(0, 31).Select(i => "sluice" + i)) + " Weirgate", "-k", "100");
        Assert.Equal("sluice-log.pdf", atCaps.GetProperty("hits")[0].GetProperty("path").GetString());
        index.Json("search", "Weirgate register", "-k", "150", "--Query:MaxResults=200");

        var badCap = index.Run("search", "Weirgate", "--Query:MaxResults=0");
        Assert.Equal(2, badCap.ExitCode);
        Assert.Contains("Query:MaxResults", badCap.Stderr, StringComparison.Ordinal);
    }

    [Fact]
    public async Task TheApiAnswers400PastTheCapsAndForARepeatedParameter()
    {
        using var temp = new Support.TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "sluice-log.pdf"), StorePdfs.Document("Weirgate", 2));
        using var daemon = RunningDaemon.Start(temp.Path, ["--root", "store", "--encoder", "hashed-terms", "--Schedule:Windows:0=Mon-Sun 00:00-24:00"]);
        daemon.WaitUntil("the document is embedded", () => daemon.GetJson("/api/status").GetProperty("liveVectorSets").GetInt64() == 2);

        var cases = new (string Query, string Setting)[]
        {
            ("q=" + new string('w', 1001), "Query:MaxCharacters"),
            ("q=" + string.Join('+', Enumerable.Range(0, 33).Select(i => "sluice" + i)), "Query:MaxTerms"),
            ("q=Weirgate&k=101", "Query:MaxResults"),
            ("q=Weirgate&q=register", "q: give the query once"),
            ("q=Weirgate&k=3&k=4", "k: give k once"),
        };
        foreach (var (query, expected) in cases)
        {
            using var response = await daemon.Client.GetAsync("/api/search?" + query);
            var body = await response.Content.ReadAsStringAsync();
            Assert.True(response.StatusCode == HttpStatusCode.BadRequest, $"{query}: {(int)response.StatusCode} {body}");
            using var json = JsonDocument.Parse(body);
            Assert.Contains(expected, json.RootElement.GetProperty("error").GetString(), StringComparison.Ordinal);
        }

        Assert.Equal("sluice-log.pdf", daemon.GetJson("/api/search?q=Weirgate+register&k=100").GetProperty("hits")[0].GetProperty("path").GetString());
        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
    }
}
