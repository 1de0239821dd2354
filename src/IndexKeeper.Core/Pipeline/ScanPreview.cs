namespace IndexKeeper.Core.Pipeline;

/// <summary>What the next scan pass would do (<see cref="ScanPass.Preview"/>), committed nowhere.</summary>
/// <param name="Summary">The figures a real pass would report; <c>PagesRemoved</c> counts <paramref name="RemovedKeys"/>.</param>
/// <param name="NewKeys">Page keys the catalog has never seen that the pass would add and queue.</param>
/// <param name="RemovedKeys">Page keys no live document would hold afterwards.</param>
/// <param name="Sample">The pages the pass would add by document kind: counts and a sample of each, for timing the encoder.</param>
public sealed record ScanPreview(
    ScanSummary Summary,
    IReadOnlyList<PreviewChange> Changes,
    IReadOnlyList<string> NewKeys,
    IReadOnlySet<string> RemovedKeys,
    IReadOnlyList<PreviewSampleStratum> Sample);
