using System.Text.Json;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// A file name may hold any byte but '/' and NUL (POSIX.1-2017, 3.170 "Filename"), so a name can carry
/// ANSI/ECMA-48 control sequences (ESC [ ... for cursor and colour, ESC ] ... BEL to set a terminal's
/// title) that would act on the operator's terminal when printed. Text output shows them escaped; --json
/// keeps the name exact (JSON escapes control characters itself, RFC 8259 section 7).
/// </summary>
public sealed class ControlCharacterNameTests
{
    private const string Clearing = "storm\u001b[2J\u001b[31mdrain.pdf";
    private const string Titling = "gate\u001b]0;owned\u0007.pdf";
    private const string Broken = "culvert\u009b1m\u202eplan.pdf";

    [Fact]
    public void NamesAreEscapedInTextAndExactInJson()
    {
        using var index = new CliIndex("store");
        index.Put("store/" + Clearing, StorePdfs.Document("Floodgate", 1));
        index.Put("store/" + Broken, "%PDF-1.7\nnot a document at all\n"u8.ToArray());
        File.CreateSymbolicLink(index.PathOf("store/" + Titling), index.PathOf("nowhere/at-all.pdf"));

        var sync = index.Run("sync");
        AssertNoControls(sync.Stdout);
        Assert.Contains(@"gate\x1B]0;owned\x07.pdf", sync.Stdout, StringComparison.Ordinal);

        var search = index.Run("search", "Floodgate register");
        Assert.True(search.ExitCode == 0, search.Stderr);
        AssertNoControls(search.Stdout);
        Assert.Contains(@"store/storm\x1B[2J\x1B[31mdrain.pdf", search.Stdout, StringComparison.Ordinal);

        var status = index.Run("status");
        Assert.True(status.ExitCode == 0, status.Stderr);
        AssertNoControls(status.Stdout);
        Assert.Contains(@"store/culvert\x9B1m\u202Eplan.pdf", status.Stdout, StringComparison.Ordinal);

        var json = index.Json("search", "Floodgate register");
        Assert.Equal(Clearing, json.GetProperty("hits")[0].GetProperty("path").GetString());
        var statusJson = index.Json("status");
        Assert.Contains(statusJson.GetProperty("quarantine").EnumerateArray(), q => q.GetProperty("path").GetString() == Broken);
        var scan = index.Run("scan", "--json");
        using var scanJson = JsonDocument.Parse(scan.Stdout);
        Assert.Contains(scanJson.RootElement.GetProperty("problems").EnumerateArray(), p => p.GetString()!.Contains(Titling, StringComparison.Ordinal));
    }

    /// <summary>No C0 control but the line feed, no DEL, no C1 control, no bidirectional override.</summary>
    private static void AssertNoControls(string text)
    {
        foreach (var c in text)
        {
            Assert.False(
                (c < ' ' && c != '\n') || c is >= '\u007f' and <= '\u009f' || c is >= '\u202a' and <= '\u202e' || c is >= '\u2066' and <= '\u2069',
                $"U+{(int)c:X4} printed raw in:\n{text}");
        }
    }
}
