using IndexKeeper.Core.Faults;
using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>
/// The open LiteDB database of a catalog and its collections, shared by the per-concept tables, with the
/// one transaction helper every change that spans records uses.
/// </summary>
/// <param name="writerDirectory">
/// The index directory when this process is the writer: LiteDB's automatic checkpoint is off, and the log is
/// folded into the data file here only while <see cref="ReaderGate"/> is held exclusively (docs/catalog.md,
/// "Readers beside a writer"). Null for a reader.
/// </param>
internal sealed class CatalogStore(LiteDatabase database, string? writerDirectory) : IDisposable
{
    /// <summary>LiteDB's own default threshold (1000 pages of 8 KiB; LiteDB's documentation of the Checkpoint pragma).</summary>
    private const long CheckpointLogBytes = 1000L * 8192;

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
            CheckpointIfNoReader(CheckpointLogBytes);
            return result;
        }
        catch
        {
            Database.Rollback();
            throw;
        }
    }

    public void Dispose()
    {
        // Fold the whole log at the end when no reader is open; else it stays for a later writer.
        CheckpointIfNoReader(1);
        Database.Dispose();
    }

    /// <summary>Folds the log into the data file when it holds at least <paramref name="logBytes"/> and no reader is open.</summary>
    private void CheckpointIfNoReader(long logBytes)
    {
        if (writerDirectory is null)
        {
            return;
        }

        var log = new FileInfo(Path.Combine(writerDirectory, CatalogSchema.LogFileName));
        if (!log.Exists || log.Length < logBytes)
        {
            return;
        }

        using var gate = ReaderGate.TryEnterExclusive(writerDirectory);
        if (gate is null)
        {
            return;
        }

        try
        {
            // LiteDB refuses every call once a write has failed (it keeps that error); its checkpoint would
            // then wait a minute for a lock the failed transaction holds. A read finds that out at once.
            _ = Meta.FindById(CatalogSchema.SchemaMetaId);
            Database.Checkpoint();
        }
        catch (Exception ex) when (ex is IOException or LiteException)
        {
            // A full or failing disk: the log keeps every committed transaction (LiteDB reads it at the next
            // open) and the next commit or close tries again; the commit that came before stays committed.
        }
    }
}
