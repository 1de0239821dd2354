using IndexKeeper.Core.Compaction;

namespace IndexKeeper.Tests.Compaction;

/// <summary>The page-word file policy (docs/compaction.md, "Page-word files"), on plain figures.</summary>
public sealed class WordFilePolicyTests
{
    private static readonly CompactionOptions Options = new() { DeadShareThreshold = 0.2 };

    [Fact]
    public void A_file_is_picked_once_its_dead_share_reaches_the_threshold()
    {
        // 1,016 bytes: 16 header, 800 live, 200 dead (19.7 %); then 210 dead of 1,026 (20.5 %).
        var under = new WordFileStats(1, 1016, 800, 10);
        var over = new WordFileStats(2, 1026, 800, 10);
        Assert.Equal(200, under.DeadBytes);
        Assert.Equal([2L], WordFilePolicy.Plan([under, over], Options, openFileId: null).Select(f => f.FileId));
    }

    [Fact]
    public void A_file_no_page_names_is_picked_whole_and_the_open_file_never()
    {
        var empty = new WordFileStats(3, 5000, 0, 0);
        var openAndDead = new WordFileStats(4, 5000, 100, 1);
        var picked = WordFilePolicy.Plan([empty, openAndDead], Options, openFileId: 4);
        Assert.Equal([3L], picked.Select(f => f.FileId));
        Assert.Equal(5000, picked[0].DeadBytes);
    }

    [Fact]
    public void A_fully_live_file_is_left_alone()
    {
        Assert.Empty(WordFilePolicy.Plan([new WordFileStats(5, 16 + 900, 900, 9)], Options, openFileId: null));
    }
}
