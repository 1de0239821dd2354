using IndexKeeper.Core.Storage;
using IndexKeeper.Service.Daemon;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Daemon;

/// <summary>The warm-up's read-ahead of the segments: every byte of each file once, measured against the file system's own lengths.</summary>
public sealed class SegmentReadAheadTests
{
    [Fact]
    public void Every_segment_is_read_through_once_and_a_file_retired_meanwhile_is_skipped()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        for (var i = 0; i < 6; i++)
        {
            File.WriteAllBytes(temp.Combine("store", $"tide-table-{i}.pdf"), StorePdfs.Document($"estuary{i}", 3));
        }

        var sync = CliRunner.Run(temp.Path, "sync", "--index", "index", "--root", "store", "--encoder", "hashed-terms");
        Assert.True(sync.ExitCode == 0, sync.Stdout + sync.Stderr);

        var folder = temp.Combine("index", "segments");
        var files = Directory.GetFiles(folder)
            .Select(f => SegmentFileNames.TryParse(Path.GetFileName(f), out var id, out var isTemp) && !isTemp ? (long?)id : null)
            .OfType<long>()
            .ToList();
        Assert.NotEmpty(files);
        var lengths = files.Sum(id => new FileInfo(SegmentFileNames.PathOf(folder, id)).Length);

        Assert.Equal(lengths, SegmentReadAhead.Read(folder, files, CancellationToken.None));

        // A segment a compaction retired after the list was taken: the others are still read.
        Assert.Equal(lengths, SegmentReadAhead.Read(folder, [.. files, files.Max() + 1000], CancellationToken.None));
    }

    [Theory]
    [InlineData(1_000, 4_000, true)]
    [InlineData(1_001, 4_000, false)]
    [InlineData(0, 0, true)]
    public void Segments_are_read_ahead_only_when_they_fit_in_a_quarter_of_the_memory(long segmentBytes, long memoryBytes, bool expected) =>
        Assert.Equal(expected, SegmentReadAhead.Fits(segmentBytes, memoryBytes));
}
