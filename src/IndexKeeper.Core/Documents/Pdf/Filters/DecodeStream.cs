namespace IndexKeeper.Core.Documents.Pdf.Filters;

/// <summary>
/// A read-only stream that decodes its source on demand. Subclasses turn input bytes into output in
/// <see cref="Produce"/>; this base buffers both sides so filters can be chained without holding a
/// whole decoded stream in memory.
/// </summary>
internal abstract class DecodeStream : Stream
{
    private readonly Stream source;
    private readonly byte[] input = new byte[8192];
    private int inputStart;
    private int inputEnd;
    private bool sourceDone;
    private byte[] output = new byte[8192];
    private int outputStart;
    private int outputEnd;
    private bool finished;

    protected DecodeStream(Stream source) => this.source = source;

    public override bool CanRead => true;

    public override bool CanSeek => false;

    public override bool CanWrite => false;

    public override long Length => throw new NotSupportedException();

    public override long Position
    {
        get => throw new NotSupportedException();
        set => throw new NotSupportedException();
    }

    public override int Read(byte[] buffer, int offset, int count) => Read(buffer.AsSpan(offset, count));

    public override int Read(Span<byte> buffer)
    {
        while (outputStart == outputEnd)
        {
            if (finished)
            {
                return 0;
            }

            outputStart = 0;
            outputEnd = 0;
            finished = !Produce();
        }

        var n = Math.Min(buffer.Length, outputEnd - outputStart);
        output.AsSpan(outputStart, n).CopyTo(buffer);
        outputStart += n;
        return n;
    }

    public override void Flush()
    {
    }

    public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();

    public override void SetLength(long value) => throw new NotSupportedException();

    public override void Write(byte[] buffer, int offset, int count) => throw new NotSupportedException();

    /// <summary>Decodes some input into output via <see cref="Emit(byte)"/>; returns false once the data has ended.</summary>
    protected abstract bool Produce();

    /// <summary>The next source byte, or -1 at the end of the source.</summary>
    protected int NextByte()
    {
        if (inputStart == inputEnd)
        {
            if (sourceDone)
            {
                return -1;
            }

            inputStart = 0;
            inputEnd = source.Read(input, 0, input.Length);
            if (inputEnd == 0)
            {
                sourceDone = true;
                return -1;
            }
        }

        return input[inputStart++];
    }

    protected void Emit(byte value)
    {
        EnsureRoom(1);
        output[outputEnd++] = value;
    }

    protected void Emit(ReadOnlySpan<byte> values)
    {
        EnsureRoom(values.Length);
        values.CopyTo(output.AsSpan(outputEnd));
        outputEnd += values.Length;
    }

    /// <summary>Bytes produced by the current <see cref="Produce"/> call so far.</summary>
    protected int Pending => outputEnd - outputStart;

    protected override void Dispose(bool disposing)
    {
        if (disposing)
        {
            source.Dispose();
        }

        base.Dispose(disposing);
    }

    private void EnsureRoom(int count)
    {
        if (outputEnd + count > output.Length)
        {
            Array.Resize(ref output, Math.Max(output.Length * 2, outputEnd + count));
        }
    }
}
