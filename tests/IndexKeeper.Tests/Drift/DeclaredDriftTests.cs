using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Tests.Drift;

/// <summary>
/// Declared drift on a real catalog and segments: a change of encoder id drifts exactly the old vectors,
/// queues exactly their pages at migration priority, searches never mix the two encoders, and the switch-over
/// makes the old vectors dead at once so compaction reclaims them.
/// </summary>
public sealed class DeclaredDriftTests : IDisposable
{
    private static readonly string[] Manual =
    [
        "chlorine dosing pump calibration weekly",
        "sluice gate inspection eastern walkway",
        "filter backwash interval at Ashby Road",
    ];

    private static readonly Dictionary<string, string> NoRoots = [];

    private readonly DriftIndex index = new();

    [Fact]
    public void A_declared_change_drifts_exactly_the_old_vectors_and_queues_exactly_their_pages_at_migration_priority()
    {
        string oldId;
        using (var first = index.Open(128))
        {
            DriftIndex.AddDocument(first.Index.Catalog, "manuals/intake.pdf", Manual);
            DriftIndex.Embed(first);
            Assert.False(first.Get<DriftOperation>().Reconcile().Migrating);
            oldId = first.Index.Encoder.Identity.Id;
            Assert.Equal(oldId, first.Index.Catalog.Encoders.ServingId());
        }

        using var second = index.Open(64);
        // A page new in this pass is fresh work, not drift.
        DriftIndex.AddDocument(second.Index.Catalog, "reports/new.pdf", "reservoir level report for March");
        var decision = second.Get<DriftOperation>().Reconcile();

        Assert.Equal(oldId, decision.ServingEncoderId);
        Assert.Equal(Manual.Select(DriftIndex.KeyOf).Order(StringComparer.Ordinal), decision.DriftedPages);
        var queue = second.Index.Catalog.Queue.InOrder().ToDictionary(q => q.Id, q => q.Priority);
        Assert.Equal(4, queue.Count);
        Assert.All(Manual.Select(DriftIndex.KeyOf), key => Assert.Equal(QueuePriority.Migration, queue[key]));
        Assert.Equal(QueuePriority.Fresh, queue[DriftIndex.KeyOf("reservoir level report for March")]);

        // The old vectors stay live and servable until the migration is complete.
        Assert.Equal(3, second.Index.Catalog.VectorSets.Live(oldId).Count);
        var record = second.Index.Catalog.Encoders.Find(second.Index.Encoder.Identity.Id)!;
        Assert.Equal("64", record.Settings["Dimensions"]);

        // Reconciling again changes nothing.
        var again = second.Get<DriftOperation>().Reconcile();
        Assert.Empty(again.QueueForMigration);
        Assert.Equal(4, second.Index.Catalog.Queue.InOrder().Count());
    }

    [Fact]
    public void Fresh_pages_are_embedded_before_migrations()
    {
        IndexTheManualWithTheFirstEncoder();

        using var second = index.Open(64);
        DriftIndex.AddDocument(second.Index.Catalog, "reports/new.pdf", "reservoir level report for March");
        second.Get<DriftOperation>().Reconcile();
        var order = second.Index.Catalog.Queue.Next(10, DateTime.UtcNow.AddMinutes(1));
        Assert.Equal(DriftIndex.KeyOf("reservoir level report for March"), order[0].Id);
        Assert.All(order.Skip(1), q => Assert.Equal(QueuePriority.Migration, q.Priority));
    }

    [Fact]
    public void Search_ranks_with_the_serving_encoder_only_while_migrating()
    {
        var oldId = IndexTheManualWithTheFirstEncoder();

        using var second = index.Open(64);
        second.Get<DriftOperation>().Reconcile();
        // Half a migration: one page gets vectors of the new encoder.
        var one = second.Index.Catalog.Pages.Find(DriftIndex.KeyOf(Manual[0]))!;
        var vectors = second.Index.Encoder.EncodePages([PageInput.From(one, second.Index.Words, NoRoots)], CancellationToken.None);
        second.Index.Store.AppendAndCommit(second.Index.Encoder.Identity, [(Core.Documents.PageKey.Parse(one.Id), vectors[0])]);
        Assert.True(second.Get<DriftOperation>().Reconcile().Migrating);

        var report = second.Get<SearchOperation>().Search("sluice gate inspection", 10, CancellationToken.None);
        Assert.Equal(oldId, report.ServingEncoderId);
        Assert.StartsWith("hashed-terms " + oldId[..12], report.Encoder, StringComparison.Ordinal);
        Assert.Null(report.Notice);
        Assert.Equal(3, report.PagesScanned); // the old encoder's three pages, none of the new one's
        Assert.Equal(DriftIndex.KeyOf(Manual[1]), report.Hits[0].PageKey);
    }

    [Fact]
    public void When_the_serving_encoder_cannot_be_built_again_search_ranks_only_migrated_pages_and_says_so()
    {
        using (var first = index.Open(128))
        {
            DriftIndex.AddDocument(first.Index.Catalog, "manuals/intake.pdf", Manual);
            DriftIndex.Embed(first);
            first.Get<DriftOperation>().Reconcile();

            // As if the old encoder's inputs had changed since: its recorded settings now build another id.
            var record = first.Index.Catalog.Encoders.Find(first.Index.Encoder.Identity.Id)!;
            record.Settings["PoolFactor"] = "2";
            first.Index.Catalog.Encoders.Put(record);
        }

        using var second = index.Open(64);
        second.Get<DriftOperation>().Reconcile();
        var page = second.Index.Catalog.Pages.Find(DriftIndex.KeyOf(Manual[1]))!;
        second.Index.Store.AppendAndCommit(second.Index.Encoder.Identity, [(Core.Documents.PageKey.Parse(page.Id), second.Index.Encoder.EncodePages([PageInput.From(page, second.Index.Words, NoRoots)], CancellationToken.None)[0])]);

        var report = second.Get<SearchOperation>().Search("sluice gate inspection", 10, CancellationToken.None);
        Assert.StartsWith("hashed-terms " + second.Index.Encoder.Identity.Id[..12], report.Encoder, StringComparison.Ordinal);
        Assert.Equal(1, report.PagesScanned);
        Assert.NotNull(report.Notice);
        Assert.Contains("1 page(s) already migrated", report.Notice, StringComparison.Ordinal);
        Assert.Equal(DriftIndex.KeyOf(Manual[1]), Assert.Single(report.Hits).PageKey);
    }

    [Fact]
    public void The_switch_over_happens_once_migration_is_complete_and_the_old_vectors_die_and_are_compacted_away()
    {
        string oldId;
        using (var first = index.Open(128))
        {
            DriftIndex.AddDocument(first.Index.Catalog, "manuals/intake.pdf", Manual);
            DriftIndex.Embed(first);
            first.Get<DriftOperation>().Reconcile();
            first.Index.Store.SealAll();
            oldId = first.Index.Encoder.Identity.Id;
        }

        using var second = index.Open(64);
        var newId = second.Index.Encoder.Identity.Id;
        second.Get<DriftOperation>().Reconcile();
        var embedded = DriftIndex.Embed(second);
        Assert.Equal(3, embedded.PagesEmbedded);

        // Everything migrated, not yet switched: the old encoder still serves, its vectors live.
        Assert.Equal(oldId, second.Index.Catalog.Encoders.ServingId());
        Assert.Equal(3, second.Index.Catalog.VectorSets.Live(oldId).Count);

        var decision = second.Get<DriftOperation>().Reconcile();
        Assert.True(decision.SwitchOver);
        Assert.Equal(newId, second.Index.Catalog.Encoders.ServingId());
        Assert.Empty(second.Index.Catalog.VectorSets.Live(oldId));
        Assert.True(second.Index.Catalog.Encoders.Find(oldId)!.Retired);
        Assert.All(second.Index.Catalog.Segments.All().Where(s => s.EncoderId == oldId), s => Assert.Equal(0, s.LiveBytes));
        Assert.Equal(newId, second.Get<SearchOperation>().Search("sluice gate", 3, CancellationToken.None).ServingEncoderId);

        second.Index.Store.SealAll();
        var compaction = second.Index.Store.Compact(second.Settings.Compaction, CancellationToken.None);
        Assert.True(compaction.BytesReclaimed > 0);
        Assert.DoesNotContain(second.Index.Catalog.Segments.All(), s => s.EncoderId == oldId);
        Assert.False(File.Exists(SegmentFileNames.PathOf(second.Index.Store.Directory, 1)));
    }

    [Fact]
    public void A_restored_page_does_not_bring_back_a_retired_encoders_vectors()
    {
        var oldId = IndexTheManualWithTheFirstEncoder();

        using var second = index.Open(64);
        second.Get<DriftOperation>().Reconcile();
        DriftIndex.Embed(second);
        Assert.True(second.Get<DriftOperation>().Reconcile().SwitchOver);

        // The document goes away and comes back (a restore): its pages' new vectors revive, the retired ones stay dead.
        var edit = new CatalogEdit();
        edit.DeleteDocuments.Add(DocumentRecord.MakeId("store", "manuals/intake.pdf"));
        edit.SetReferences.AddRange(Manual.Select(t => (DriftIndex.KeyOf(t), 0)));
        second.Index.Catalog.Apply(edit);
        second.Index.Catalog.RemoveUnreferencedPages();
        DriftIndex.AddDocument(second.Index.Catalog, "manuals/intake.pdf", Manual);
        Assert.Equal(3, second.Index.Catalog.VectorSets.Live(second.Index.Encoder.Identity.Id).Count);
        Assert.Empty(second.Index.Catalog.VectorSets.Live(oldId));
    }

    [Fact]
    public void An_index_made_before_drift_tracking_keeps_serving_its_encoder_and_migrates()
    {
        string oldId;
        using (var first = index.Open(128))
        {
            // As an older build left it: vectors and an encoder record, no serving encoder, no settings.
            DriftIndex.AddDocument(first.Index.Catalog, "manuals/intake.pdf", Manual);
            DriftIndex.Embed(first);
            oldId = first.Index.Encoder.Identity.Id;
            Assert.Null(first.Index.Catalog.Encoders.ServingId());
            Assert.Empty(first.Index.Catalog.Encoders.Find(oldId)!.Settings);
        }

        using var second = index.Open(64);
        var report = second.Get<SearchOperation>().Search("sluice gate inspection", 10, CancellationToken.None);
        Assert.Equal(oldId, report.ServingEncoderId);
        Assert.Null(report.Notice);
        Assert.Equal(3, report.PagesScanned);

        var decision = second.Get<DriftOperation>().Reconcile();
        Assert.Equal(oldId, second.Index.Catalog.Encoders.ServingId());
        Assert.Equal(3, decision.QueueForMigration.Count);
    }

    public void Dispose() => index.Dispose();

    /// <summary>The manual indexed and embedded with d = 128, drift reconciled; returns that encoder's id.</summary>
    private string IndexTheManualWithTheFirstEncoder()
    {
        using var first = index.Open(128);
        DriftIndex.AddDocument(first.Index.Catalog, "manuals/intake.pdf", Manual);
        DriftIndex.Embed(first);
        first.Get<DriftOperation>().Reconcile();
        return first.Index.Encoder.Identity.Id;
    }
}
