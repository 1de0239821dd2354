namespace IndexKeeper.Core.Storage;

/// <summary>What <see cref="SegmentInspector"/> found in one segment file.</summary>
/// <param name="Missing">The file is not there.</param>
/// <param name="Header">The file's header, or null when it is missing or its header cannot be read.</param>
/// <param name="FileProblem">Why no record of the file can be read (missing, bad header), or null.</param>
/// <param name="Unreadable">Locations whose record cannot be read; every location when <paramref name="FileProblem"/> is set.</param>
/// <param name="SealProblem">Why the seal does not hold, when a seal was expected and checked; null otherwise.</param>
public sealed record SegmentInspection(
    bool Missing,
    SegmentHeader? Header,
    string? FileProblem,
    IReadOnlyList<UnreadableRecord> Unreadable,
    string? SealProblem)
{
    public bool Clean => FileProblem is null && Unreadable.Count == 0 && SealProblem is null;
}
