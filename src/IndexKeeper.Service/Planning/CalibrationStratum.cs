using IndexKeeper.Core.Catalog;

namespace IndexKeeper.Service.Planning;

/// <summary>The pages of one document kind that the calibration times, and the kind's share of all pages.</summary>
public sealed record CalibrationStratum(string Kind, double Share, IReadOnlyList<PageRecord> Pages);
