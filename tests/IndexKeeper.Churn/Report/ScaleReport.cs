namespace IndexKeeper.Churn.Report;

/// <summary>Figures of the large run (hashed-term encoder).</summary>
internal sealed record ScaleReport(
    int Pages,
    int Files,
    double GenerateSeconds,
    double FirstSyncSeconds,
    double FirstScanSeconds,
    long PagesEmbedded,
    double NoChangeScanSeconds,
    long NoChangeFilesHashed,
    long PeakWorkingSetBytes,
    long CatalogBytes,
    long SegmentBytes,
    double SearchP50Milliseconds,
    double SearchP95Milliseconds,
    int Searches,
    string Machine);
