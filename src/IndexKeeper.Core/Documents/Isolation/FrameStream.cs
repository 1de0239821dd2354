using System.Buffers.Binary;

namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>Writes and reads whole frames on a pipe (layout in docs/reader-worker.md).</summary>
internal static class FrameStream
{
    public static byte[] Encode(Frame frame)
    {
        var bytes = new byte[ReadWorkerProtocol.HeaderLength + frame.Body.Length];
        ReadWorkerProtocol.Magic.CopyTo(bytes);
        bytes[4] = (byte)frame.Type;
        BinaryPrimitives.WriteInt32LittleEndian(bytes.AsSpan(5, 4), frame.Body.Length);
        frame.Body.CopyTo(bytes, ReadWorkerProtocol.HeaderLength);
        return bytes;
    }

    public static async Task WriteAsync(Stream stream, Frame frame, CancellationToken cancellationToken)
    {
        await stream.WriteAsync(Encode(frame), cancellationToken).ConfigureAwait(false);
        await stream.FlushAsync(cancellationToken).ConfigureAwait(false);
    }

    /// <summary>Reads one frame; null when the stream ends cleanly before a frame begins.</summary>
    /// <exception cref="EndOfStreamException">The stream ended inside a frame.</exception>
    /// <exception cref="ReaderProtocolException">The bytes are not a frame.</exception>
    public static async Task<Frame?> ReadAsync(Stream stream, CancellationToken cancellationToken)
    {
        var first = await ReadFirstByteAsync(stream, cancellationToken).ConfigureAwait(false);
        return first < 0 ? null : await ReadRestAsync(stream, (byte)first, cancellationToken).ConfigureAwait(false);
    }

    /// <summary>Reads the first byte of the next frame; -1 at the end of the stream.</summary>
    public static async Task<int> ReadFirstByteAsync(Stream stream, CancellationToken cancellationToken)
    {
        var one = new byte[1];
        var read = await stream.ReadAsync(one, cancellationToken).ConfigureAwait(false);
        return read == 0 ? -1 : one[0];
    }

    /// <summary>Reads the rest of a frame whose first byte was already read.</summary>
    public static async Task<Frame> ReadRestAsync(Stream stream, byte first, CancellationToken cancellationToken)
    {
        var header = new byte[ReadWorkerProtocol.HeaderLength];
        header[0] = first;
        await stream.ReadExactlyAsync(header.AsMemory(1), cancellationToken).ConfigureAwait(false);
        if (!header.AsSpan(0, 4).SequenceEqual(ReadWorkerProtocol.Magic))
        {
            throw new ReaderProtocolException($"expected a frame, got bytes {Convert.ToHexString(header)}");
        }

        var type = (FrameType)header[4];
        if (!Enum.IsDefined(type))
        {
            throw new ReaderProtocolException($"unknown frame type {header[4]}");
        }

        var length = BinaryPrimitives.ReadInt32LittleEndian(header.AsSpan(5, 4));
        if (length is < 0 or > ReadWorkerProtocol.MaxBodyLength)
        {
            throw new ReaderProtocolException($"frame body of {(uint)length} bytes is over the limit");
        }

        var body = new byte[length];
        await stream.ReadExactlyAsync(body, cancellationToken).ConfigureAwait(false);
        return new Frame(type, body);
    }
}
