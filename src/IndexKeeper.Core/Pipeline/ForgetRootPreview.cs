namespace IndexKeeper.Core.Pipeline;

/// <summary>What forgetting a root would do (<see cref="ScanPass.PreviewForgetRoot"/>), committed nowhere.</summary>
/// <param name="Root">The root name.</param>
/// <param name="Documents">Documents the index keeps under that name, live or quarantined.</param>
/// <param name="PagesRemoved">Page keys only these documents hold: removed, their vector sets dead until compaction reclaims them.</param>
/// <param name="PagesKept">Page keys these documents share with documents of other roots: kept, with their vectors.</param>
public sealed record ForgetRootPreview(string Root, long Documents, long PagesRemoved, long PagesKept);
