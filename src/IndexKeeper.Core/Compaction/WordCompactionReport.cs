namespace IndexKeeper.Core.Compaction;

/// <summary>
/// What word-file compaction did: files rewritten with their live records, files deleted because no page
/// record named them, bytes read, written and reclaimed, and each file left alone because a live record in
/// it failed its checks (named with the reason; <c>verify</c> names the pages).
/// </summary>
public sealed record WordCompactionReport(int FilesRewritten, int FilesDeleted, long BytesRead, long BytesWritten, long BytesReclaimed, IReadOnlyList<string> Damaged)
{
    public static WordCompactionReport None { get; } = new(0, 0, 0, 0, 0, []);
}
