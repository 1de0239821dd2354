namespace IndexKeeper.Core.Catalog;

/// <summary>What the catalog holds of one root: documents by state, the pages they show (with repeats) and their bytes.</summary>
/// <param name="QuarantinedDocuments">Quarantined documents of the root, those of a type no reader takes included.</param>
/// <param name="PageLocations">Pages of the root's live documents, a page key counted once per place it appears.</param>
/// <param name="Bytes">File sizes of the root's live documents.</param>
public sealed record RootTotals(string Root, long LiveDocuments, long QuarantinedDocuments, long PageLocations, long Bytes);
