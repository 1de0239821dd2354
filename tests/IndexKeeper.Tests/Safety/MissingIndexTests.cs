using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Safety;

/// <summary>
/// A command that reads or tends an index never creates one and never replaces a lost or damaged catalog:
/// it says what is missing and how to recover, and leaves every byte where it was.
/// </summary>
public sealed class MissingIndexTests
{
    [Theory]
    [InlineData("status")]
    [InlineData("verify")]
    [InlineData("compact")]
    [InlineData("encoders")]
    public void A_mistyped_index_exits_2_and_creates_nothing(string command)
    {
        using var temp = new TempDirectory();
        var result = CliRunner.Run(temp.Path, command, "--index", "indx", "--encoder", "hashed-terms");
        Assert.Equal(2, result.ExitCode);
        Assert.Contains("There is no index at", result.Stderr, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", result.Stderr, StringComparison.Ordinal);
        Assert.False(Directory.Exists(temp.Combine("indx")));
    }

    [Fact]
    public void A_search_over_a_lost_catalog_keeps_every_segment()
    {
        // Before: the search created an empty catalog, the repair at open took every segment for an orphan and
        // deleted it, and the search answered no hits with exit 0.
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "ferry-timetable.pdf"), StorePdfs.Document("Gullstone", 2));
        var sync = CliRunner.Run(temp.Path, "sync", "--index", "index", "--root", "store", "--encoder", "hashed-terms");
        Assert.True(sync.ExitCode == 0, sync.Stderr);
        var segments = Directory.GetFiles(temp.Combine("index", "segments")).Order(StringComparer.Ordinal).ToList();
        var bytes = segments.Select(File.ReadAllBytes).ToList();
        Assert.NotEmpty(segments);
        File.Move(temp.Combine("index", "catalog.db"), temp.Combine("catalog.db.saved"));

        var search = CliRunner.Run(temp.Path, "search", "Gullstone", "--index", "index", "--encoder", "hashed-terms");

        Assert.Equal(2, search.ExitCode);
        Assert.Contains("catalog", search.Stderr, StringComparison.Ordinal);
        Assert.Contains("left untouched", search.Stderr, StringComparison.Ordinal);
        Assert.False(File.Exists(temp.Combine("index", "catalog.db")));
        Assert.Equal(segments, Directory.GetFiles(temp.Combine("index", "segments")).Order(StringComparer.Ordinal).ToList());
        Assert.Equal(bytes, segments.Select(File.ReadAllBytes).ToList());

        // The catalog back in place, the index serves as before.
        File.Move(temp.Combine("catalog.db.saved"), temp.Combine("index", "catalog.db"));
        var again = CliRunner.Run(temp.Path, "search", "Gullstone", "--index", "index", "--encoder", "hashed-terms");
        Assert.True(again.ExitCode == 0, again.Stderr);
        Assert.Contains("ferry-timetable.pdf", again.Stdout, StringComparison.Ordinal);
    }

    [Fact]
    public void A_damaged_catalog_is_named_with_its_recovery_and_left_as_it_is()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "ferry-timetable.pdf"), StorePdfs.Document("Gullstone", 2));
        Assert.Equal(0, CliRunner.Run(temp.Path, "sync", "--index", "index", "--root", "store", "--encoder", "hashed-terms").ExitCode);
        var catalog = temp.Combine("index", "catalog.db");
        using (var file = new FileStream(catalog, FileMode.Open, FileAccess.Write))
        {
            // The first page of a LiteDB file is its header page (8 KiB, from memory: LiteDB 5's page size).
            file.Write(Enumerable.Repeat((byte)0xFF, 8192).ToArray());
        }

        var damaged = File.ReadAllBytes(catalog);
        foreach (var command in new[] { "status", "search" })
        {
            string[] args = command == "search" ? ["search", "Gullstone"] : [command];
            var result = CliRunner.Run(temp.Path, [.. args, "--index", "index", "--encoder", "hashed-terms"]);
            Assert.Equal(1, result.ExitCode);
            Assert.Contains($"The catalog '{catalog}' cannot be read", result.Stderr, StringComparison.Ordinal);
            Assert.Contains("docs/recovery.md", result.Stderr, StringComparison.Ordinal);
            Assert.DoesNotContain("   at ", result.Stderr, StringComparison.Ordinal);
            Assert.Equal(damaged, File.ReadAllBytes(catalog));
        }
    }
}
