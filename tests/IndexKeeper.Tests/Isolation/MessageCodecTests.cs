using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Isolation;

namespace IndexKeeper.Tests.Isolation;

public sealed class MessageCodecTests
{
    [Fact]
    public void Request_matches_the_worked_example_of_the_spec()
    {
        // The bytes of the example in docs/reader-worker.md, so the document and the code agree.
        var expected = Convert.FromHexString(
            "494B5257022A000000" + "0A0000002F7372762F612E706466" + "0000002000000000" + "88130000"
            + "0000001000000000" + "0046C32300000000");
        var limits = new ReadLimits(512L * 1024 * 1024, 5000, 256L * 1024 * 1024, TimeSpan.FromSeconds(60));

        Assert.Equal(expected, FrameStream.Encode(MessageCodec.Request("/srv/a.pdf", limits)));
        Assert.Equal(Convert.FromHexString("494B52570102000000" + "0200"), StandInWorker.Hello());
    }

    [Fact]
    public void Request_round_trips()
    {
        var limits = new ReadLimits(7, 8, 9, TimeSpan.FromMilliseconds(1234));
        var (path, decoded) = MessageCodec.DecodeRequest(MessageCodec.Request("/srv/Häfen/ä.pdf", limits));

        Assert.Equal("/srv/Häfen/ä.pdf", path);
        Assert.Equal(limits, decoded);
    }

    [Fact]
    public void Content_round_trips_every_field()
    {
        var content = SampleContent();

        var decoded = MessageCodec.DecodeContent(MessageCodec.Content(content));

        Assert.Equal(ReadOutcome.Describe(content), ReadOutcome.Describe(decoded));
    }

    [Fact]
    public void Refusal_and_fault_round_trip()
    {
        var refusal = MessageCodec.DecodeRefusal(MessageCodec.Refusal(QuarantineReason.Encrypted, "needs a password"));
        var (type, message) = MessageCodec.DecodeFault(MessageCodec.Fault(new InvalidDataException("bad table")));

        Assert.Equal(QuarantineReason.Encrypted, refusal.Reason);
        Assert.Equal("needs a password", refusal.Message);
        Assert.Equal("System.IO.InvalidDataException", type);
        Assert.Equal("bad table", message);
    }

    [Fact]
    public void Every_truncation_of_a_content_body_is_a_protocol_error()
    {
        var body = MessageCodec.Content(SampleContent()).Body;
        for (var length = 0; length < body.Length; length++)
        {
            var cut = new Frame(FrameType.Content, body[..length]);
            Assert.Throws<ReaderProtocolException>(() => MessageCodec.DecodeContent(cut));
        }
    }

    [Fact]
    public void Trailing_bytes_are_a_protocol_error()
    {
        var body = MessageCodec.Refusal(QuarantineReason.Corrupt, "x").Body;
        Assert.Throws<ReaderProtocolException>(() => MessageCodec.DecodeRefusal(new Frame(FrameType.Refusal, [.. body, 0])));
    }

    [Fact]
    public void A_count_larger_than_the_body_is_refused_before_allocating()
    {
        // Kind 1, then a page count of 2^31 - 1 with no pages behind it.
        var body = Convert.FromHexString("01000000" + "FFFFFF7F");
        var error = Assert.Throws<ReaderProtocolException>(() => MessageCodec.DecodeContent(new Frame(FrameType.Content, body)));
        Assert.Contains("does not fit", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Unknown_numbers_are_protocol_errors()
    {
        var kind = Convert.FromHexString("63000000" + "00000000");
        var reason = Convert.FromHexString("63000000" + "00000000");

        Assert.Throws<ReaderProtocolException>(() => MessageCodec.DecodeContent(new Frame(FrameType.Content, kind)));
        Assert.Throws<ReaderProtocolException>(() => MessageCodec.DecodeRefusal(new Frame(FrameType.Refusal, reason)));
        Assert.Throws<ReaderProtocolException>(() => MessageCodec.DecodeContent(MessageCodec.Hello()));
    }

    [Theory]
    [InlineData("746869732069732074657874", "expected a frame")] // "this is text"
    [InlineData("494B525709000000", "unknown frame type")]
    [InlineData("494B525703FFFFFF7F", "over the limit")]
    public async Task Bad_headers_are_protocol_errors(string hex, string expected)
    {
        using var stream = new MemoryStream(Convert.FromHexString(hex + "00000000000000"));
        var error = await Assert.ThrowsAsync<ReaderProtocolException>(() => FrameStream.ReadAsync(stream, CancellationToken.None));
        Assert.Contains(expected, error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_stream_ends_cleanly_only_between_frames()
    {
        var frame = FrameStream.Encode(MessageCodec.Hello());
        using var whole = new MemoryStream(frame);
        using var cut = new MemoryStream(frame[..^1]);

        Assert.NotNull(await FrameStream.ReadAsync(whole, CancellationToken.None));
        Assert.Null(await FrameStream.ReadAsync(whole, CancellationToken.None));
        await Assert.ThrowsAsync<EndOfStreamException>(() => FrameStream.ReadAsync(cut, CancellationToken.None));
    }

    internal static DocumentContent SampleContent() => new(
        DocumentKind.Pdf,
        [
            new PageContent(1, PageKey.Of("page one"u8), 595.28f, 841.89f, 90, [new PageWord("Harrowmere", new PageBox(60, 760, 150.5f, 774)), new PageWord("", new PageBox(-1, -2, 3, 4))]),
            new PageContent(2, PageKey.Of("page two"u8), 612, 792, 0, []),
        ])
    {
        Title = "Harrowmere dredging plan, Häfen edition",
    };
}
