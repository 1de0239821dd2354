namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>Encodes and decodes the body of each frame type (layout in docs/reader-worker.md).</summary>
internal static class MessageCodec
{
    // Smallest encoded page: number, key, width, height, rotation, word count.
    private const int MinimumPageBytes = 4 + PageKey.ByteLength + 4 + 4 + 4 + 4;

    // Smallest encoded word: an empty text and its box.
    private const int MinimumWordBytes = 4 + (4 * 4);

    public static Frame Hello()
    {
        var body = new BodyWriter();
        body.WriteUInt16(ReadWorkerProtocol.Version);
        return new Frame(FrameType.Hello, body.ToArray());
    }

    public static ushort DecodeHello(Frame frame)
    {
        var body = Open(frame, FrameType.Hello);
        var version = body.ReadUInt16();
        body.EnsureEnd();
        return version;
    }

    public static Frame Request(string path, ReadLimits limits)
    {
        var body = new BodyWriter();
        body.WriteString(path);
        body.WriteInt64(limits.MaxFileBytes);
        body.WriteInt32(limits.MaxPages);
        body.WriteInt64(limits.MaxDecodedBytesPerStream);
        body.WriteInt64(limits.ReadTimeout.Ticks);
        return new Frame(FrameType.ReadRequest, body.ToArray());
    }

    public static (string Path, ReadLimits Limits) DecodeRequest(Frame frame)
    {
        var body = Open(frame, FrameType.ReadRequest);
        var path = body.ReadString();
        var limits = new ReadLimits(
            MaxFileBytes: body.ReadInt64(),
            MaxPages: body.ReadInt32(),
            MaxDecodedBytesPerStream: body.ReadInt64(),
            ReadTimeout: TimeSpan.FromTicks(body.ReadInt64()));
        body.EnsureEnd();
        return (path, limits);
    }

    public static Frame Content(DocumentContent content)
    {
        var body = new BodyWriter();
        body.WriteInt32((int)content.Kind);
        body.WriteInt32(content.Pages.Count);
        Span<byte> key = stackalloc byte[PageKey.ByteLength];
        foreach (var page in content.Pages)
        {
            body.WriteInt32(page.Number);
            Convert.FromHexString(page.Key.Hex, key, out _, out _);
            body.WriteBytes(key);
            body.WriteSingle(page.Width);
            body.WriteSingle(page.Height);
            body.WriteInt32(page.Rotation);
            body.WriteInt32(page.Words.Count);
            foreach (var word in page.Words)
            {
                body.WriteString(word.Text);
                body.WriteSingle(word.Box.Left);
                body.WriteSingle(word.Box.Bottom);
                body.WriteSingle(word.Box.Right);
                body.WriteSingle(word.Box.Top);
            }
        }

        body.WriteString(content.Title ?? string.Empty);
        return new Frame(FrameType.Content, body.ToArray());
    }

    public static DocumentContent DecodeContent(Frame frame)
    {
        var body = Open(frame, FrameType.Content);
        var kind = (DocumentKind)body.ReadInt32();
        if (!Enum.IsDefined(kind))
        {
            throw new ReaderProtocolException($"unknown document kind {(int)kind}");
        }

        var pages = new PageContent[body.ReadCount(MinimumPageBytes)];
        for (var i = 0; i < pages.Length; i++)
        {
            var number = body.ReadInt32();
            var key = PageKey.FromHash(body.ReadBytes(PageKey.ByteLength));
            var width = body.ReadSingle();
            var height = body.ReadSingle();
            var rotation = body.ReadInt32();
            var words = new PageWord[body.ReadCount(MinimumWordBytes)];
            for (var w = 0; w < words.Length; w++)
            {
                var text = body.ReadString();
                words[w] = new PageWord(text, new PageBox(body.ReadSingle(), body.ReadSingle(), body.ReadSingle(), body.ReadSingle()));
            }

            pages[i] = new PageContent(number, key, width, height, rotation, words);
        }

        var title = body.ReadString();
        body.EnsureEnd();
        return new DocumentContent(kind, pages) { Title = DocumentTitle.Clean(title) };
    }

    public static Frame Refusal(QuarantineReason reason, string message)
    {
        var body = new BodyWriter();
        body.WriteInt32((int)reason);
        body.WriteString(message);
        return new Frame(FrameType.Refusal, body.ToArray());
    }

    public static DocumentReadException DecodeRefusal(Frame frame)
    {
        var body = Open(frame, FrameType.Refusal);
        var reason = (QuarantineReason)body.ReadInt32();
        if (!Enum.IsDefined(reason))
        {
            throw new ReaderProtocolException($"unknown quarantine reason {(int)reason}");
        }

        var message = body.ReadString();
        body.EnsureEnd();
        return new DocumentReadException(reason, message);
    }

    public static Frame Fault(Exception exception)
    {
        var body = new BodyWriter();
        body.WriteString(exception.GetType().FullName ?? exception.GetType().Name);
        body.WriteString(exception.Message);
        return new Frame(FrameType.Fault, body.ToArray());
    }

    /// <summary>The failed reader's exception type and message.</summary>
    public static (string ExceptionType, string Message) DecodeFault(Frame frame)
    {
        var body = Open(frame, FrameType.Fault);
        var type = body.ReadString();
        var message = body.ReadString();
        body.EnsureEnd();
        return (type, message);
    }

    private static BodyReader Open(Frame frame, FrameType expected) =>
        frame.Type == expected
            ? new BodyReader(frame.Body)
            : throw new ReaderProtocolException($"expected a {expected} frame, got {frame.Type}");
}
