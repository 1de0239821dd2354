using IndexKeeper.Core.Catalog;

namespace IndexKeeper.Service.Hosting;

/// <summary>The last canary figures of one encoder, as <c>status</c> and <c>encoders</c> print them.</summary>
public sealed record CanaryReport(DateTime CheckedUtc, int Pages, long Vectors, double MeanCosine, double MinimumCosine, bool Drifted)
{
    public static CanaryReport? Of(EncoderRecord? record) =>
        record?.CanaryCheckedUtc is { } checkedUtc
            ? new CanaryReport(DateTime.SpecifyKind(checkedUtc.ToUniversalTime(), DateTimeKind.Utc), record.CanaryPages, record.CanaryVectors, record.CanaryMeanCosine, record.CanaryMinimumCosine, record.CanaryDrifted)
            : null;
}
