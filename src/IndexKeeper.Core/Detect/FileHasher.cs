namespace IndexKeeper.Core.Detect;

/// <summary>Hands out the file hasher (see docs/detect.md for why SHA-256).</summary>
public static class FileHasher
{
    /// <summary>Read size per call: large enough that a typical document is one or two reads.</summary>
    public const int DefaultBufferSize = 256 * 1024;

    public static IFileHasher Create(int bufferSize = DefaultBufferSize, TimeProvider? clock = null)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(bufferSize, 1);
        return new StreamingFileHasher(bufferSize, clock ?? TimeProvider.System, afterChunk: null);
    }
}
