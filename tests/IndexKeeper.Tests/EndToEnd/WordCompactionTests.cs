using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Faults;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// Compaction of page-word files on the real executable (docs/compaction.md, "Page-word files"): words of
/// deleted documents are reclaimed, every live page keeps the very words it had, a crash at each of the new
/// fault points leaves an index that verifies with the same words, and a damaged file is reported and kept.
/// The words are those PdfPig's builder drew on the pages, read back through the catalog's locations.
/// </summary>
public sealed class WordCompactionTests : IDisposable
{
    private const string Line = "Outfall weir cleared of reed before the spring tide";
    private readonly CliIndex index = new("store");

    public WordCompactionTests()
    {
        // Three documents synced into one word file, then two of them deleted: two thirds of it are dead.
        index.Put("store/logs/weir.pdf", StorePdfs.Document("weir", 3, 2, Line));
        index.Put("store/logs/pump.pdf", StorePdfs.Document("pump", 3));
        index.Put("store/logs/valve.pdf", StorePdfs.Document("valve", 3));
        index.Json("sync");
        index.Delete("store/logs/pump.pdf");
        index.Delete("store/logs/valve.pdf");
        index.Json("sync");
    }

    public void Dispose() => index.Dispose();

    [Fact]
    public void Compaction_reclaims_dead_word_records_and_keeps_every_live_page_s_words()
    {
        var before = PageWords();
        var bytesBefore = WordFileBytes();
        Assert.Equal(3, before.Count);
        Assert.True(bytesBefore > LiveWordBytes(), "the setup left no dead word records");

        var report = index.Json("compact").GetProperty("words");
        Assert.Equal(1, report.GetProperty("filesRewritten").GetInt32());
        Assert.Equal(bytesBefore - WordFileBytes(), report.GetProperty("bytesReclaimed").GetInt64());

        Assert.Equal(before, PageWords());
        Assert.Equal(LiveWordBytes(), WordFileBytes());
        Assert.Contains(Line.Split(' ')[1], before.Values.Single(w => w.Contains(Line.Split(' ')[0], StringComparison.Ordinal)), StringComparison.Ordinal);
        Assert.Equal(0, index.Run("verify").ExitCode);

        // Nothing more is due: a second run rewrites nothing.
        Assert.Equal(0, index.Json("compact").GetProperty("words").GetProperty("filesRewritten").GetInt32());
    }

    [Theory]
    [InlineData(FaultPoints.WordsCompactionBeforeFsync)]
    [InlineData(FaultPoints.WordsCompactionBeforeCommit)]
    [InlineData(FaultPoints.WordsCompactionAfterCommit)]
    [InlineData(FaultPoints.WordsCompactionDeleteBefore)]
    public void A_crash_at_each_word_compaction_point_leaves_the_same_words_and_the_next_compaction_reclaims_the_rest(string point)
    {
        var before = PageWords();
        var stopped = index.RunWith(new Dictionary<string, string> { [FaultInjection.Variable] = point + ":exit" }, "compact");
        Assert.True(stopped.ExitCode == FaultInjection.ExitCode, $"{point}: exit {stopped.ExitCode}\n{stopped.Stdout}\n{stopped.Stderr}");

        Assert.Equal(before, PageWords());
        var verify = index.Run("verify");
        Assert.True(verify.ExitCode == 0, $"{point}: verify after the crash\n{verify.Stdout}\n{verify.Stderr}");

        index.Json("compact");
        Assert.Equal(before, PageWords());
        Assert.Equal(LiveWordBytes(), WordFileBytes());
        Assert.Equal(0, index.Run("verify").ExitCode);
    }

    [Fact]
    public void A_word_file_with_a_damaged_live_record_is_reported_and_kept_as_it_is()
    {
        var (file, offset) = FirstLiveRecord();
        var path = index.PathOf("index/words/" + PageWordFormat.FileName(file));
        var bytes = File.ReadAllBytes(path);
        bytes[offset + PageWordFormat.FrameLength + 40] ^= 0x5A;
        File.WriteAllBytes(path, bytes);

        var result = index.Run("compact");
        Assert.True(result.ExitCode == 1, $"exit {result.ExitCode}\n{result.Stdout}\n{result.Stderr}");
        Assert.Contains($"page-word file {file} left as it is", result.Stdout, StringComparison.Ordinal);
        Assert.Equal(bytes, File.ReadAllBytes(path));
        Assert.Equal(1, index.Run("verify").ExitCode);
    }

    /// <summary>Every page's words as one string, read through the catalog's locations (each record checked).</summary>
    private Dictionary<string, string> PageWords()
    {
        using var gate = ReaderGate.EnterShared(index.PathOf("index"));
        using var catalog = IndexCatalog.OpenReadOnly(gate);
        using var store = PageWordStore.OpenForReading(index.PathOf("index"));
        return catalog.Pages.WordLocations().ToDictionary(
            p => p.Key,
            p => string.Join(' ', store.Read(PageKey.Parse(p.Key), new PageWordsLocation(p.At.File, p.At.Offset, p.At.Length, unchecked((uint)p.At.Checksum))).Select(w => w.Text)),
            StringComparer.Ordinal);
    }

    /// <summary>What fully compacted files hold: a header per file the catalog names and the records it names.</summary>
    private long LiveWordBytes()
    {
        using var gate = ReaderGate.EnterShared(index.PathOf("index"));
        using var catalog = IndexCatalog.OpenReadOnly(gate);
        var locations = catalog.Pages.WordLocations().Select(p => p.At).ToList();
        return (locations.Select(a => a.File).Distinct().Count() * PageWordFormat.HeaderLength) + locations.Sum(a => (long)a.Length);
    }

    private long WordFileBytes() =>
        Directory.EnumerateFiles(index.PathOf("index/words")).Sum(f => new FileInfo(f).Length);

    private (long File, int Offset) FirstLiveRecord()
    {
        using var gate = ReaderGate.EnterShared(index.PathOf("index"));
        using var catalog = IndexCatalog.OpenReadOnly(gate);
        var at = catalog.Pages.WordLocations().Select(p => p.At).OrderBy(a => a.Offset).First();
        return (at.File, (int)at.Offset);
    }
}
