using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Isolation;

namespace IndexKeeper.Tests.Isolation;

/// <summary>The worker side of the protocol, run in-process over in-memory pipes.</summary>
public sealed class ReadWorkerHostTests
{
    [Fact]
    public async Task Announces_itself_then_answers_each_request_in_order()
    {
        var seen = new List<string>();
        await using var worker = new HostUnderTest(new DelegateReader((path, limits, _) =>
        {
            seen.Add($"{path} {limits.MaxPages}");
            return MessageCodecTests.SampleContent();
        }));

        Assert.Equal(ReadWorkerProtocol.Version, MessageCodec.DecodeHello(await worker.NextFrameAsync()));
        var first = await worker.AskAsync("/srv/one.pdf", ReadLimits.Default with { MaxPages = 3 });
        var second = await worker.AskAsync("/srv/two.pdf", ReadLimits.Default);

        Assert.Equal(ReadOutcome.Describe(MessageCodecTests.SampleContent()), ReadOutcome.Describe(MessageCodec.DecodeContent(first)));
        Assert.Equal(FrameType.Content, second.Type);
        Assert.Equal(["/srv/one.pdf 3", "/srv/two.pdf 5000"], seen);
        Assert.Equal(ReadWorkerHost.ExitInputClosed, await worker.CloseAsync());
    }

    [Fact]
    public async Task A_refusal_keeps_its_reason_and_message()
    {
        await using var worker = new HostUnderTest(new DelegateReader((_, _, _) =>
            throw new DocumentReadException(QuarantineReason.Encrypted, "needs a password")));

        var refusal = MessageCodec.DecodeRefusal(await worker.AskAsync("/srv/locked.pdf", ReadLimits.Default));

        Assert.Equal(QuarantineReason.Encrypted, refusal.Reason);
        Assert.Equal("needs a password", refusal.Message);
    }

    [Fact]
    public async Task Out_of_memory_is_a_refusal_with_its_own_reason()
    {
        await using var worker = new HostUnderTest(new DelegateReader((_, _, _) => throw new OutOfMemoryException()));

        var refusal = MessageCodec.DecodeRefusal(await worker.AskAsync("/srv/huge.pdf", ReadLimits.Default));

        Assert.Equal(QuarantineReason.ReaderOutOfMemory, refusal.Reason);
    }

    [Fact]
    public async Task Any_other_exception_is_a_fault_and_the_worker_goes_on()
    {
        var calls = 0;
        await using var worker = new HostUnderTest(new DelegateReader((_, _, _) =>
            ++calls == 1 ? throw new InvalidDataException("bad cross-reference table") : MessageCodecTests.SampleContent()));

        var (type, message) = MessageCodec.DecodeFault(await worker.AskAsync("/srv/a.pdf", ReadLimits.Default));
        var next = await worker.AskAsync("/srv/b.pdf", ReadLimits.Default);

        Assert.Equal(typeof(InvalidDataException).FullName, type);
        Assert.Equal("bad cross-reference table", message);
        Assert.Equal(FrameType.Content, next.Type);
    }

    [Fact]
    public async Task A_reader_that_honours_its_token_is_stopped_at_the_read_timeout()
    {
        await using var worker = new HostUnderTest(new DelegateReader((_, _, token) =>
        {
            Task.Delay(Timeout.Infinite, token).GetAwaiter().GetResult();
            return MessageCodecTests.SampleContent();
        }));

        var refusal = MessageCodec.DecodeRefusal(await worker.AskAsync("/srv/slow.pdf", ReadLimits.Default with { ReadTimeout = TimeSpan.FromMilliseconds(200) }));

        Assert.Equal(QuarantineReason.ReadTimeout, refusal.Reason);
    }

    [Fact]
    public async Task Closing_the_input_ends_the_worker_even_in_the_middle_of_a_read()
    {
        using var never = new ManualResetEventSlim();
        using var started = new ManualResetEventSlim();
        await using var worker = new HostUnderTest(new DelegateReader((_, _, _) =>
        {
            started.Set();
            never.Wait();
            return MessageCodecTests.SampleContent();
        }));
        await worker.NextFrameAsync();
        await worker.SendAsync(MessageCodec.Request("/srv/stuck.pdf", ReadLimits.Default));
        Assert.True(started.Wait(TimeSpan.FromMinutes(1)));

        Assert.Equal(ReadWorkerHost.ExitInputClosed, await worker.CloseAsync());
        never.Set();
    }

    [Fact]
    public async Task Bytes_that_are_not_a_request_end_the_worker_with_the_usage_code()
    {
        await using var worker = new HostUnderTest(new DelegateReader((_, _, _) => MessageCodecTests.SampleContent()));
        await worker.NextFrameAsync();

        await worker.SendRawAsync("GET / HTTP/1.1\r\n\r\n"u8.ToArray());

        Assert.Equal(ReadWorkerHost.ExitProtocolError, await worker.ExitCodeAsync());
    }

    /// <summary>A worker host on a background thread with a test at the other end of its pipes.</summary>
    private sealed class HostUnderTest : IAsyncDisposable
    {
        private static readonly TimeSpan Bound = TimeSpan.FromMinutes(1);
        private readonly InMemoryPipe requests = new();
        private readonly InMemoryPipe replies = new();
        private readonly Task<int> run;
        private bool helloSeen;

        public HostUnderTest(IDocumentReader reader) =>
            run = Task.Run(() => ReadWorkerHost.Run(requests.Reader, replies.Writer, reader, CancellationToken.None));

        public async Task<Frame> NextFrameAsync()
        {
            helloSeen = true;
            return await FrameStream.ReadAsync(replies.Reader, CancellationToken.None).WaitAsync(Bound) ?? throw new EndOfStreamException();
        }

        public Task SendAsync(Frame frame) => FrameStream.WriteAsync(requests.Writer, frame, CancellationToken.None);

        public Task SendRawAsync(byte[] bytes) => requests.Writer.WriteAsync(bytes).AsTask();

        public async Task<Frame> AskAsync(string path, ReadLimits limits)
        {
            if (!helloSeen)
            {
                await NextFrameAsync();
            }

            await SendAsync(MessageCodec.Request(path, limits));
            return await NextFrameAsync();
        }

        public async Task<int> CloseAsync()
        {
            await requests.Writer.DisposeAsync();
            return await ExitCodeAsync();
        }

        public Task<int> ExitCodeAsync() => run.WaitAsync(Bound);

        public async ValueTask DisposeAsync()
        {
            await requests.Writer.DisposeAsync();
            await run.WaitAsync(Bound);
        }
    }
}
