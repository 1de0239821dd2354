namespace IndexKeeper.Core.Catalog;

/// <summary>Counts read from the catalog for <c>status</c>.</summary>
/// <param name="QuarantinedDocuments">Quarantined documents other than those of a type no reader takes: these count towards health.</param>
/// <param name="UnsupportedDocuments">Documents an include glob selected, of a type no reader takes (quarantined as Unsupported, and not named as a readable type): counted, not a fault.</param>
public sealed record CatalogFigures(long Documents, long QuarantinedDocuments, long UnsupportedDocuments, long Pages, long PageLocations, long Queued, DateTime? LastScanUtc);
