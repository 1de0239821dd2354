namespace IndexKeeper.Core.Catalog;

/// <summary>Counts read from the catalog for <c>status</c>.</summary>
public sealed record CatalogFigures(long Documents, long QuarantinedDocuments, long Pages, long PageLocations, long Queued, DateTime? LastScanUtc);
