namespace IndexKeeper.Core.Compaction;

/// <summary>Why a compaction job was chosen.</summary>
public enum CompactionReason
{
    /// <summary>The segments hold no live vector set: delete them, nothing to copy.</summary>
    Drop,

    /// <summary>Each segment's dead share reached the threshold: copy the live rest into fresh segments.</summary>
    DeadShare,

    /// <summary>Several small segments of similar size: merge them into fewer, larger ones.</summary>
    SmallSegments,
}
