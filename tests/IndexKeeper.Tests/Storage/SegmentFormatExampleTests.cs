using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Tests.Storage;

/// <summary>The worked example of docs/segment-format.md, byte for byte: the spec and the writer must agree.</summary>
public sealed class SegmentFormatExampleTests
{
    private const string ExampleHex =
        "494b565345470d0a" + "01000000" + "40000000" + "2a00000000000000" + "0034f8a6c1010000" + "40000000" + "01010100" + "1100"
        + "6861736865642d7465726d732f37663361" + "00" + "1295bb99"
        + "ea347c8f" + "c0000000" + "01000000" + "64456c7f"
        + "993c360650bae63e4e64110b069f14ccf14fdf04810dfa5f0ecdc7e6cbc5d355" + "01000000" + "00000000"
        + "00b00030003000b00030003000b00030003000b00030003000b00030003000b00030003000b00030003000b00030003000b00030003000b00030003000b00030"
        + "003000b00030003000b00030003000b00030003000b00030003000b00030003000b00030003000b00030003000b00030003000b00030003000b00030003000b0"
        + "b66ddbb66ddbb66d"
        + "0000904200002f440000074400003444"
        + "3b0a8a08" + "18000000" + "02000000" + "659c02f5"
        + "0100000000000000" + "1001000000000000" + "abf2c1bf" + "00000000";

    [Fact]
    public void The_writer_produces_the_documented_example()
    {
        using var dir = new TempDirectory();
        var key = PageKey.Of("Harrowmere Water Authority, annual report 2030, page 1"u8);
        var vector = Enumerable.Range(0, 64).Select(i => i % 3 == 0 ? -0.125f : 0.125f).ToArray();
        RecordLocation location;
        string path;
        using (var writer = SegmentWriter.Create(dir.Path, new SegmentHeader(42, "hashed-terms/7f3a", 64, new DateTimeOffset(2031, 3, 14, 8, 0, 0, TimeSpan.Zero))))
        {
            location = writer.Append(key, VectorQuantization.ToFloat16(vector), [new PageBox(72, 700, 540, 720)]);
            path = writer.Seal().Path;
        }

        Assert.Equal("seg-000042.vec", Path.GetFileName(path));
        Assert.Equal(new RecordLocation(42, 64, 208, 0x8F7C34EA), location);
        Assert.Equal(ExampleHex, Convert.ToHexStringLower(File.ReadAllBytes(path)));
    }
}
