using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// What <see cref="PageWordStore.Rewrite"/> wrote: the new file and where each live record moved. The catalog
/// applies <see cref="Moves"/> in one transaction; only then may the old file be deleted.
/// </summary>
/// <param name="BytesRead">Bytes of live records read (and checked) from the old file.</param>
/// <param name="BytesWritten">Bytes of the new file.</param>
public sealed record PageWordsRewrite(long OldFile, long NewFile, IReadOnlyDictionary<PageKey, PageWordsLocation> Moves, long BytesRead, long BytesWritten);
