using IndexKeeper.Core.Faults;
using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>
/// The open LiteDB database of a catalog and its collections, shared by the per-concept tables, with the
/// one transaction helper every change that spans records uses.
/// </summary>
internal sealed class CatalogStore(LiteDatabase database) : IDisposable
{
    public LiteDatabase Database { get; } = database;

    public ILiteCollection<BsonDocument> Meta { get; } = database.GetCollection(CatalogSchema.Meta);

    public ILiteCollection<DocumentRecord> Documents { get; } = database.GetCollection<DocumentRecord>(CatalogSchema.Documents);

    public ILiteCollection<PageRecord> Pages { get; } = database.GetCollection<PageRecord>(CatalogSchema.Pages);

    public ILiteCollection<QueueRecord> Queue { get; } = database.GetCollection<QueueRecord>(CatalogSchema.Queue);

    public ILiteCollection<ScanRecord> Scans { get; } = database.GetCollection<ScanRecord>(CatalogSchema.Scans);

    public ILiteCollection<EncoderRecord> Encoders { get; } = database.GetCollection<EncoderRecord>(CatalogSchema.Encoders);

    public ILiteCollection<SegmentRecord> Segments { get; } = database.GetCollection<SegmentRecord>(CatalogSchema.Segments);

    public ILiteCollection<VectorSetRecord> VectorSets { get; } = database.GetCollection<VectorSetRecord>(CatalogSchema.VectorSets);

    /// <summary>Runs <paramref name="change"/> as one transaction: all of it is committed, or none (rolled back on any exception).</summary>
    public void InTransaction(Action change) => InTransaction(() =>
    {
        change();
        return true;
    });

    /// <inheritdoc cref="InTransaction(Action)"/>
    public T InTransaction<T>(Func<T> change)
    {
        ArgumentNullException.ThrowIfNull(change);
        Database.BeginTrans();
        try
        {
            var result = change();
            FaultInjection.Reach(FaultPoints.CatalogCommitBefore);
            Database.Commit();
            FaultInjection.Reach(FaultPoints.CatalogCommitAfter);
            return result;
        }
        catch
        {
            Database.Rollback();
            throw;
        }
    }

    public void Dispose() => Database.Dispose();
}
