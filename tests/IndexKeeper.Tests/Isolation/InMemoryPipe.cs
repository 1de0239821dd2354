using System.Threading.Channels;

namespace IndexKeeper.Tests.Isolation;

/// <summary>
/// A one-way in-memory pipe: what <see cref="Writer"/> writes, <see cref="Reader"/> reads, and a read
/// waits until bytes arrive or the writer is disposed (the end of the stream), as on an OS pipe.
/// </summary>
internal sealed class InMemoryPipe
{
    private readonly Channel<byte[]> chunks = Channel.CreateUnbounded<byte[]>();

    public InMemoryPipe()
    {
        Reader = new ReadEnd(chunks.Reader);
        Writer = new WriteEnd(chunks.Writer);
    }

    public Stream Reader { get; }

    public Stream Writer { get; }

    private sealed class ReadEnd(ChannelReader<byte[]> source) : Stream
    {
        private ReadOnlyMemory<byte> current;

        public override bool CanRead => true;

        public override bool CanSeek => false;

        public override bool CanWrite => false;

        public override long Length => throw new NotSupportedException();

        public override long Position { get => throw new NotSupportedException(); set => throw new NotSupportedException(); }

        public override async ValueTask<int> ReadAsync(Memory<byte> buffer, CancellationToken cancellationToken = default)
        {
            while (current.IsEmpty)
            {
                if (!await source.WaitToReadAsync(cancellationToken).ConfigureAwait(false))
                {
                    return 0;
                }

                if (source.TryRead(out var chunk))
                {
                    current = chunk;
                }
            }

            var count = Math.Min(buffer.Length, current.Length);
            current[..count].CopyTo(buffer);
            current = current[count..];
            return count;
        }

        public override int Read(byte[] buffer, int offset, int count) =>
            ReadAsync(buffer.AsMemory(offset, count)).AsTask().GetAwaiter().GetResult();

        public override void Flush()
        {
        }

        public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();

        public override void SetLength(long value) => throw new NotSupportedException();

        public override void Write(byte[] buffer, int offset, int count) => throw new NotSupportedException();
    }

    private sealed class WriteEnd(ChannelWriter<byte[]> target) : Stream
    {
        public override bool CanRead => false;

        public override bool CanSeek => false;

        public override bool CanWrite => true;

        public override long Length => throw new NotSupportedException();

        public override long Position { get => throw new NotSupportedException(); set => throw new NotSupportedException(); }

        public override void Write(byte[] buffer, int offset, int count)
        {
            if (!target.TryWrite(buffer.AsSpan(offset, count).ToArray()))
            {
                throw new IOException("the pipe is closed");
            }
        }

        public override void Flush()
        {
        }

        public override int Read(byte[] buffer, int offset, int count) => throw new NotSupportedException();

        public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();

        public override void SetLength(long value) => throw new NotSupportedException();

        protected override void Dispose(bool disposing)
        {
            target.TryComplete();
            base.Dispose(disposing);
        }
    }
}
