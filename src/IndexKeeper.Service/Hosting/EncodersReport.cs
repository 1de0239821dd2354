using IndexKeeper.Core.Drift;

namespace IndexKeeper.Service.Hosting;

/// <summary>Every encoder id in an index with its counts, role and drift state: what <c>encoders --json</c> prints.</summary>
public sealed class EncodersReport
{
    public string ActiveEncoderId { get; init; } = string.Empty;

    public string ServingEncoderId { get; init; } = string.Empty;

    /// <summary>A migration from the serving to the active encoder is in progress.</summary>
    public bool Migrating { get; init; }

    public long PagesDrifted { get; init; }

    public long PagesMigrated { get; init; }

    /// <summary>The last canary check ran now (<c>--check-canaries</c>) and is in <see cref="Encoders"/>.</summary>
    public bool CanariesCheckedNow { get; init; }

    public IReadOnlyList<EncoderReportEntry> Encoders { get; init; } = [];

    public static EncodersReport Build(IndexSession session, bool canariesCheckedNow = false)
    {
        ArgumentNullException.ThrowIfNull(session);
        var activeId = session.Encoder.Identity.Id;
        DriftDecision drift = session.ReadDrift();
        var counts = session.Catalog.VectorSets.CountsByEncoder();
        var records = session.Catalog.Encoders.All().ToDictionary(e => e.Id, StringComparer.Ordinal);
        var ids = records.Keys.Concat(counts.Keys).Append(activeId).Distinct(StringComparer.Ordinal);
        var migrating = drift.ServingEncoderId != activeId;
        var entries = new List<EncoderReportEntry>();
        foreach (var id in ids)
        {
            var record = records.GetValueOrDefault(id);
            var (live, total) = counts.GetValueOrDefault(id);
            var active = id == activeId;
            var serving = id == drift.ServingEncoderId;
            entries.Add(new EncoderReportEntry
            {
                Id = id,
                Name = record?.Name ?? (active ? session.Encoder.Identity.Name : "unknown"),
                Description = record?.Description ?? (active ? session.Encoder.Identity.Description : string.Empty),
                Dimensions = record?.Dimensions ?? (active ? session.Encoder.Identity.Dimensions : 0),
                LiveVectorSets = live,
                VectorSets = total,
                Active = active,
                Serving = serving,
                Retired = record?.Retired ?? false,
                PagesMigrated = active && migrating ? drift.MigratedPages : null,
                PagesToMigrate = active && migrating ? drift.PagesToMigrate : null,
                PagesDrifted = serving && migrating ? drift.DriftedPages.Count : null,
                FirstUsedUtc = record?.FirstUsedUtc.ToUniversalTime() ?? default,
                Canary = CanaryReport.Of(record),
            });
        }

        return new EncodersReport
        {
            ActiveEncoderId = activeId,
            ServingEncoderId = drift.ServingEncoderId,
            Migrating = migrating,
            PagesDrifted = drift.DriftedPages.Count,
            PagesMigrated = drift.MigratedPages,
            CanariesCheckedNow = canariesCheckedNow,
            Encoders = entries.OrderByDescending(e => e.Serving).ThenByDescending(e => e.Active).ThenBy(e => e.Retired).ThenBy(e => e.FirstUsedUtc).ToList(),
        };
    }
}
