using IndexKeeper.Core.Drift;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Service.Application;

/// <summary><c>encoders</c>: every encoder id in the index with its counts, role and drift state; <c>--check-canaries</c> checks first.</summary>
public sealed class EncodersOperation(OpenIndex index, DriftOperation drift, CanaryOperation canaries)
{
    /// <summary>Records the active encoder (declared drift applied), then re-embeds its canary pages now.</summary>
    /// <remarks>REQUIRES: the index is open for writing and nothing else writes it.</remarks>
    public CanaryFigures CheckCanaries(CancellationToken cancellationToken)
    {
        drift.Reconcile();
        return canaries.Check(cancellationToken);
    }

    /// <param name="canariesCheckedNow">The report follows <see cref="CheckCanaries"/>.</param>
    public EncodersReport Read(bool canariesCheckedNow)
    {
        var active = index.Encoder.Identity;
        var decision = drift.Read();
        var counts = index.Catalog.VectorSets.CountsByEncoder();
        var records = index.Catalog.Encoders.All().ToDictionary(e => e.Id, StringComparer.Ordinal);
        var ids = records.Keys.Concat(counts.Keys).Append(active.Id).Distinct(StringComparer.Ordinal);
        var migrating = decision.ServingEncoderId != active.Id;
        var entries = new List<EncoderReportEntry>();
        foreach (var id in ids)
        {
            var record = records.GetValueOrDefault(id);
            var (live, total) = counts.GetValueOrDefault(id);
            var isActive = id == active.Id;
            var serving = id == decision.ServingEncoderId;
            entries.Add(new EncoderReportEntry
            {
                Id = id,
                Name = record?.Name ?? (isActive ? active.Name : "unknown"),
                Description = record?.Description ?? (isActive ? active.Description : string.Empty),
                Dimensions = record?.Dimensions ?? (isActive ? active.Dimensions : 0),
                LiveVectorSets = live,
                VectorSets = total,
                Active = isActive,
                Serving = serving,
                Retired = record?.Retired ?? false,
                PagesMigrated = isActive && migrating ? decision.MigratedPages : null,
                PagesToMigrate = isActive && migrating ? decision.PagesToMigrate : null,
                PagesDrifted = serving && migrating ? decision.DriftedPages.Count : null,
                FirstUsedUtc = record?.FirstUsedUtc.ToUniversalTime() ?? default,
                Canary = CanaryReport.Of(record),
            });
        }

        return new EncodersReport
        {
            ActiveEncoderId = active.Id,
            ServingEncoderId = decision.ServingEncoderId,
            Migrating = migrating,
            PagesDrifted = decision.DriftedPages.Count,
            PagesMigrated = decision.MigratedPages,
            CanariesCheckedNow = canariesCheckedNow,
            Encoders = entries.OrderByDescending(e => e.Serving).ThenByDescending(e => e.Active).ThenBy(e => e.Retired).ThenBy(e => e.FirstUsedUtc).ToList(),
        };
    }
}
