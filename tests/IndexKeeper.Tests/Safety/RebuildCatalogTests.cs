using System.Text.Json;
using IndexKeeper.Core.Storage;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Safety;

/// <summary>
/// A lost catalog is rebuilt from the self-describing segments plus a scan of the roots: the search answers
/// as before and no page whose vectors survive is embedded again (docs/recovery.md).
/// </summary>
public sealed class RebuildCatalogTests
{
    private static readonly string[] Queries = ["Gullstone ferry", "Marrowby tide", "Quillan harbour dues"];

    private static readonly string[] Common = ["--index", "index", "--encoder", "hashed-terms"];

    [Fact]
    public void A_deleted_catalog_is_rebuilt_and_the_search_answers_as_before()
    {
        // Before: a lost catalog could only be restored from a backup, or every page embedded again.
        using var temp = new TempDirectory();
        var before = SyncedStore(temp);
        Assert.All(before, hits => Assert.NotEmpty(hits));
        var segments = Directory.GetFiles(temp.Combine("index", "segments")).Order(StringComparer.Ordinal).ToList();
        var bytes = segments.Select(File.ReadAllBytes).ToList();

        File.Delete(temp.Combine("index", "catalog.db"));
        var rebuild = CliRunner.Run(temp.Path, ["rebuild-catalog", "--root", "store", "--json", .. Common]);

        Assert.True(rebuild.ExitCode == 0, rebuild.Stderr + rebuild.Stdout);
        using var summary = JsonDocument.Parse(rebuild.Stdout);
        Assert.Equal(0, summary.RootElement.GetProperty("pagesEmbedded").GetInt32());
        Assert.Equal(0, summary.RootElement.GetProperty("pagesQueued").GetInt64());
        Assert.Equal(7, summary.RootElement.GetProperty("liveVectorSets").GetInt64());
        Assert.Equal(before, Queries.Select(q => Hits(temp.Path, q)).ToList());

        // The segment files are neither deleted nor rewritten, and the index is whole.
        Assert.Equal(segments, Directory.GetFiles(temp.Combine("index", "segments")).Order(StringComparer.Ordinal).ToList());
        Assert.Equal(bytes, segments.Select(File.ReadAllBytes).ToList());
        var verify = CliRunner.Run(temp.Path, ["verify", .. Common]);
        Assert.True(verify.ExitCode == 0, verify.Stdout + verify.Stderr);

        // A second rebuild keeps the first rebuilt catalog aside rather than deleting it.
        var again = CliRunner.Run(temp.Path, ["rebuild-catalog", "--root", "store", "--json", .. Common]);
        Assert.True(again.ExitCode == 0, again.Stderr);
        Assert.Single(Directory.GetFiles(temp.Combine("index"), "catalog.db.before-rebuild-*"));
    }

    [Fact]
    public void A_set_aside_segment_with_a_bad_record_gives_back_every_other_record()
    {
        // Before: the rebuild read no file in segments/orphaned/, and its walk stopped at the first bad record,
        // so every page after it was embedded again.
        using var temp = new TempDirectory();
        var before = SyncedStore(temp);
        var segment = Assert.Single(Directory.GetFiles(temp.Combine("index", "segments"), "seg-*.vec"));
        RecordLocation second;
        using (var reader = SegmentReader.Open(segment))
        {
            second = reader.Scan().Records[1].Location;
        }

        var bytes = File.ReadAllBytes(segment);
        bytes[second.Offset + (second.Length / 2)] ^= 0x10;
        File.Delete(segment);
        Directory.CreateDirectory(temp.Combine("index", "segments", "orphaned"));
        File.WriteAllBytes(temp.Combine("index", "segments", "orphaned", Path.GetFileName(segment)), bytes);
        File.Delete(temp.Combine("index", "catalog.db"));

        var rebuild = CliRunner.Run(temp.Path, ["rebuild-catalog", "--root", "store", "--json", .. Common]);

        // Exit 1: a record was lost to damage and is named; the file came back under its own name.
        Assert.True(rebuild.ExitCode == 1, rebuild.Stderr + rebuild.Stdout);
        using var summary = JsonDocument.Parse(rebuild.Stdout);
        Assert.Contains("orphaned/" + Path.GetFileName(segment), Assert.Single(summary.RootElement.GetProperty("filesTakenBack").EnumerateArray()).GetString(), StringComparison.Ordinal);
        Assert.Contains("1 record(s) before it and 5 good one(s) after it", Assert.Single(summary.RootElement.GetProperty("problems").EnumerateArray()).GetString(), StringComparison.Ordinal);
        Assert.True(File.Exists(segment));
        Assert.Equal(6, summary.RootElement.GetProperty("liveVectorSets").GetInt64());
        Assert.Equal(1, summary.RootElement.GetProperty("pagesQueued").GetInt64());

        // The next sync embeds only the page whose record was bad, and the search answers as before.
        var resync = CliRunner.Run(temp.Path, ["sync", "--root", "store", "--json", .. Common]);
        Assert.True(resync.ExitCode == 0, resync.Stderr + resync.Stdout);
        using var resyncSummary = JsonDocument.Parse(resync.Stdout);
        Assert.Equal(1, resyncSummary.RootElement.GetProperty("pagesEmbedded").GetInt32());
        Assert.Equal(before, Queries.Select(q => Hits(temp.Path, q)).ToList());

        // The unsealed damaged file was sealed as it was, so verify finds nothing left to repair.
        var verify = CliRunner.Run(temp.Path, ["verify", .. Common]);
        Assert.True(verify.ExitCode == 0, verify.Stdout + verify.Stderr);
    }

    /// <summary>Three documents (seven pages) synced into <c>index</c>; each query's hits.</summary>
    private static List<List<string>> SyncedStore(TempDirectory temp)
    {
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "ferry-timetable.pdf"), StorePdfs.Document("Gullstone ferry", 3));
        File.WriteAllBytes(temp.Combine("store", "tide-tables.pdf"), StorePdfs.Document("Marrowby tide", 2));
        File.WriteAllBytes(temp.Combine("store", "harbour-dues.pdf"), StorePdfs.Document("Quillan harbour dues", 2));
        var sync = CliRunner.Run(temp.Path, ["sync", "--root", "store", .. Common]);
        Assert.True(sync.ExitCode == 0, sync.Stderr);
        return Queries.Select(q => Hits(temp.Path, q)).ToList();
    }

    /// <summary>Each hit as path, page and score.</summary>
    private static List<string> Hits(string directory, string query)
    {
        var result = CliRunner.Run(directory, ["search", query, "--json", .. Common]);
        Assert.True(result.ExitCode == 0, result.Stderr);
        using var json = JsonDocument.Parse(result.Stdout);
        return json.RootElement.GetProperty("hits").EnumerateArray()
            .Select(h => $"{h.GetProperty("path").GetString()} {h.GetProperty("page").GetInt32()} {h.GetProperty("score").GetDouble()}")
            .ToList();
    }
}
