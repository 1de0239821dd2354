using IndexKeeper.Core.Catalog;

namespace IndexKeeper.Core.Pipeline;

/// <summary>
/// New pages of one document kind in a dry run: how many the pass would add, and a uniform random sample of
/// them with their words (<see cref="PreviewSampler"/>), for timing the encoder per kind.
/// </summary>
public sealed record PreviewSampleStratum(string Kind, long Pages, IReadOnlyList<PageRecord> Sample)
{
    /// <summary>Pages kept per kind: enough to pick pages across the sizes of a kind (docs/plan.md, "Calibration").</summary>
    public const int SampleLimit = 64;
}
