using IndexKeeper.Core.Storage;

namespace IndexKeeper.Tests.Storage;

public sealed class SegmentFileNamesTests
{
    [Fact]
    public void Names_round_trip()
    {
        Assert.Equal("seg-000042.vec", SegmentFileNames.Name(42));
        Assert.Equal("seg-000042.vec.tmp", SegmentFileNames.TempName(42));
        Assert.Equal("seg-12345678.vec", SegmentFileNames.Name(12345678));
        foreach (var id in new long[] { 0, 7, 999999, 1000000, long.MaxValue })
        {
            Assert.True(SegmentFileNames.TryParse(SegmentFileNames.Name(id), out var parsed, out var temp));
            Assert.Equal((id, false), (parsed, temp));
            Assert.True(SegmentFileNames.TryParse(SegmentFileNames.TempName(id), out parsed, out temp));
            Assert.Equal((id, true), (parsed, temp));
        }
    }

    [Theory]
    [InlineData("seg-42.vec")]
    [InlineData("seg-0000042.vec")]
    [InlineData("seg-00004a.vec")]
    [InlineData("seg-000042.vec.bak")]
    [InlineData("catalog.db")]
    [InlineData("seg-+00042.vec")]
    public void Other_names_are_not_segments(string name) => Assert.False(SegmentFileNames.TryParse(name, out _, out _));
}
