namespace IndexKeeper.Core.Detect;

/// <summary>Streams a file through SHA-256 and tells whether the file held still while it was read.</summary>
public interface IFileHasher
{
    /// <summary>Hashes the file at <paramref name="path"/>; the stat taken just before opening is the baseline.</summary>
    /// <exception cref="OperationCanceledException">When <paramref name="cancellationToken"/> fires.</exception>
    FileHashResult Hash(string path, CancellationToken cancellationToken);

    /// <summary>Hashes a walked file; its walk stat is the baseline, so a file replaced since the walk is Unstable.</summary>
    /// <exception cref="OperationCanceledException">When <paramref name="cancellationToken"/> fires.</exception>
    FileHashResult Hash(FoundFile file, CancellationToken cancellationToken);
}
