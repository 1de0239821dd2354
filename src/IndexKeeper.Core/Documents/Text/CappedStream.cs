namespace IndexKeeper.Core.Documents.Text;

/// <summary>A memory stream that refuses to grow past a cap: decoding an attachment stops there.</summary>
internal sealed class CappedStream(long cap) : MemoryStream
{
    public override void Write(byte[] buffer, int offset, int count)
    {
        if (Length + count > cap)
        {
            throw new FullException();
        }

        base.Write(buffer, offset, count);
    }

    public override void Write(ReadOnlySpan<byte> buffer)
    {
        if (Length + buffer.Length > cap)
        {
            throw new FullException();
        }

        base.Write(buffer);
    }

    public override void WriteByte(byte value) => Write([value]);

    /// <summary>Thrown when a write would pass the cap.</summary>
    public sealed class FullException : Exception;
}
