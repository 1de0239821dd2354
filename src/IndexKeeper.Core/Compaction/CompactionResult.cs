using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Compaction;

/// <summary>
/// What a compaction job wrote: the new sealed segments and where each live record moved. The catalog
/// applies <see cref="Moves"/> and drops the job's segments in one transaction; only then are the old
/// segments retired.
/// </summary>
/// <param name="BytesRead">Bytes of live records read (and checked) from the old segments.</param>
/// <param name="BytesWritten">Bytes of the new segment files; the write cost of the job.</param>
public sealed record CompactionResult(
    CompactionJob Job,
    IReadOnlyDictionary<RecordLocation, RecordLocation> Moves,
    IReadOnlyList<SealedSegment> NewSegments,
    long BytesRead,
    long BytesWritten);
