namespace IndexKeeper.Cli.Commands;

/// <summary>What <c>rebuild-catalog</c> did (<c>--json</c>); <see cref="PagesEmbedded"/> is always 0: a rebuild never encodes.</summary>
internal sealed record RebuildCatalogReport(
    string? OldCatalogMovedTo,
    int SegmentsRestored,
    int VectorSetsRestored,
    long LiveVectorSets,
    int DuplicateRecords,
    long DocumentsSeen,
    long PagesSeen,
    long PagesQueued,
    int PagesEmbedded,
    IReadOnlyList<string> FilesTakenBack,
    IReadOnlyList<string> Problems);
