using IndexKeeper.Core.Detect;

namespace IndexKeeper.Tests.Detect;

public sealed class LinuxPathCodecTests
{
    private static byte[] Terminated(byte[] bytes) => [.. bytes, 0];

    [Theory]
    [InlineData("plain-name.pdf")]
    [InlineData("Überprüfung – Pumpwerk Nord.pdf")]
    [InlineData("点検記録 😀.pdf")]
    public void Leaves_valid_utf8_names_as_dotnet_reads_them(string name)
    {
        var bytes = System.Text.Encoding.UTF8.GetBytes(name);

        Assert.Equal(name, LinuxPathCodec.Decode(bytes));
        Assert.Equal(Terminated(bytes), LinuxPathCodec.EncodeTerminated(name));
    }

    [Fact]
    public void Round_trips_any_bytes_through_a_string_that_survives_utf8_storage()
    {
        var random = new Random(20240601);
        for (var i = 0; i < 20_000; i++)
        {
            var bytes = new byte[random.Next(0, 24)];
            random.NextBytes(bytes);
            // Bias towards the interesting area: escape-range characters (EF 9E xx / EF 9F xx) and lone continuation bytes.
            if (i % 3 == 0 && bytes.Length >= 3)
            {
                bytes[0] = 0xEF;
                bytes[1] = (byte)(0x9E + (i % 2));
            }

            var name = LinuxPathCodec.Decode(bytes);

            Assert.Equal(Terminated(bytes), LinuxPathCodec.EncodeTerminated(name));
            Assert.Equal(name, System.Text.Encoding.UTF8.GetString(System.Text.Encoding.UTF8.GetBytes(name)));
        }
    }

    [Fact]
    public void Keeps_two_names_apart_that_differ_only_in_invalid_bytes()
    {
        var first = LinuxPathCodec.Decode([0x61, 0xFF]);
        var second = LinuxPathCodec.Decode([0x61, 0xFE]);
        var lookalike = LinuxPathCodec.Decode(System.Text.Encoding.UTF8.GetBytes("a\uF7FF"));

        Assert.Equal(3, new HashSet<string>([first, second, lookalike]).Count);
        Assert.Equal("a\uF7FF", first);
    }
}
