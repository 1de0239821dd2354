namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>
/// Constants of the reader-worker protocol spoken over the worker's stdin and stdout; the grammar is in
/// docs/reader-worker.md, whose version must equal <see cref="Version"/>.
/// </summary>
internal static class ReadWorkerProtocol
{
    /// <summary>Protocol version the worker announces in its hello frame. Raise it on any change of layout.</summary>
    public const ushort Version = 2;

    /// <summary>"IKRW" in ASCII: the first four bytes of every frame. Never change within a version.</summary>
    public static ReadOnlySpan<byte> Magic => "IKRW"u8;

    /// <summary>Magic (4) + frame type (1) + body length (4, little-endian).</summary>
    public const int HeaderLength = 9;

    /// <summary>
    /// Bodies above this are refused, so that stray output cannot make the supervisor allocate without
    /// bound. A 5,000-page document with 500 words a page needs about 100 MiB.
    /// </summary>
    public const int MaxBodyLength = 512 * 1024 * 1024;
}
