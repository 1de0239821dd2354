using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Queue;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Catalog;

/// <summary>
/// The running counts against a full count by the catalog's own queries (<see cref="IndexCatalog.Figures"/>, the
/// queue's depths, the per-root totals, the live page keys of each encoder), after random sequences of the
/// writes the daemon makes: adds, changes, deletes, moves, embeds, compactions, forgotten vectors, forget-root,
/// a migration step with its switch-over, quarantined queue entries and a rolled-back edit. Also what <c>status</c>
/// lists from them: vector-set records live or not, live documents by kind, the quarantined documents.
/// </summary>
public sealed class RunningCountsTests
{
    private const string First = "enc-first";
    private const string Second = "enc-second";

    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    [InlineData(4)]
    public void Running_counts_equal_a_full_count_after_random_writes(int seed)
    {
        using var temp = new TempDirectory();
        using var held = IndexLock.Acquire(temp.Path, "test");
        using var catalog = IndexCatalog.Open(held);
        var world = new World(catalog, new Random(seed));
        for (var step = 0; step < 300; step++)
        {
            world.Step();
            if (step % 7 == 0)
            {
                AssertEqualsFullCount(catalog, world.Active);
            }
        }

        AssertEqualsFullCount(catalog, world.Active);
        Assert.Empty(catalog.Counts.Recount());
    }

    [Fact]
    public void A_catalog_opened_again_counts_from_its_records()
    {
        using var temp = new TempDirectory();
        using (var held = IndexLock.Acquire(temp.Path, "test"))
        using (var catalog = IndexCatalog.Open(held))
        {
            var world = new World(catalog, new Random(9));
            for (var step = 0; step < 60; step++)
            {
                world.Step();
            }
        }

        using (var held = IndexLock.Acquire(temp.Path, "test"))
        using (var catalog = IndexCatalog.Open(held))
        {
            AssertEqualsFullCount(catalog, First);
        }
    }

    private static void AssertEqualsFullCount(IndexCatalog catalog, string active)
    {
        var counts = catalog.Counts;
        counts.Refresh();
        Assert.Equal(catalog.Figures(), counts.Figures());
        Assert.Equal(catalog.Queue.Depths().OrderBy(d => d.Key), counts.Depths().OrderBy(d => d.Key));
        foreach (var at in new[] { DateTime.MinValue, World.Start, World.Start.AddHours(5), World.Start.AddDays(1), World.Start.AddDays(400), DateTime.MaxValue })
        {
            Assert.Equal(catalog.Queue.Due(at), counts.Due(at));
        }

        Assert.Equal(catalog.VectorSets.Count(liveOnly: true), counts.LiveVectorSets);
        Assert.Equal(catalog.VectorSets.Count(liveOnly: false), counts.VectorSetRecords);
        Assert.Equal(catalog.Documents.LiveByKind().OrderBy(k => k.Key), counts.LiveByKind().OrderBy(k => k.Key));
        Assert.Equal(catalog.Documents.Quarantined().Select(d => d.Id).Order(StringComparer.Ordinal), counts.QuarantinedDocumentIds());
        Assert.Equal(catalog.Documents.TotalsByRoot(), counts.TotalsByRoot());

        var serving = catalog.Encoders.ServingId() ?? active;
        var referenced = catalog.Pages.ReferencedKeys().ToList();
        var servingKeys = catalog.VectorSets.LivePageKeysOf(serving);
        var activeKeys = catalog.VectorSets.LivePageKeysOf(active);
        var queued = catalog.Queue.InOrder().Select(q => q.Id).ToHashSet(StringComparer.Ordinal);
        var expected = new PageCoverage(
            referenced.Count,
            referenced.Count(servingKeys.Contains),
            referenced.Count(activeKeys.Contains),
            referenced.Count(k => !servingKeys.Contains(k) && !queued.Contains(k)));
        Assert.Equal(expected, counts.Coverage(serving, active));

        // status's drift figures from the counts, against the drift policy's own pass over every live page key.
        if (catalog.Encoders.ServingId() is { } recorded)
        {
            var decision = DriftReconciler.Read(catalog, active);
            var (drifted, migrated) = counts.Migration(recorded, active);
            Assert.Equal(decision.DriftedPages.Count, drifted);
            Assert.Equal(decision.MigratedPages, migrated);
            Assert.Equal(decision.ServingEncoderId, drifted == 0 ? active : recorded);
        }
    }

    /// <summary>Drives the catalog as the scan, the embed pass, compaction, forget-root and drift would.</summary>
    private sealed class World(IndexCatalog catalog, Random random)
    {
        public static readonly DateTime Start = new(2031, 3, 1, 0, 0, 0, DateTimeKind.Utc);

        private readonly DateTime at = Start;
        private readonly string[] roots = ["north", "south", "east"];
        private bool migrated;

        public string Active { get; private set; } = First;

        public void Step()
        {
            switch (random.Next(12))
            {
                case 0 or 1 or 2:
                    Put(DocumentRecord.MakeId(Pick(roots), $"d{random.Next(40)}.pdf"));
                    break;
                case 3:
                    Delete(PickDocument());
                    break;
                case 4:
                    Move(PickDocument());
                    break;
                case 5 or 6:
                    Embed();
                    break;
                case 7:
                    Compact();
                    break;
                case 8:
                    ForgetSomeVectors();
                    break;
                case 9:
                    ForgetRoot(Pick(roots));
                    break;
                case 10:
                    QuarantineOrRollBack();
                    break;
                default:
                    Migrate();
                    break;
            }
        }

        private T Pick<T>(IReadOnlyList<T> items) => items[random.Next(items.Count)];

        private DocumentRecord? PickDocument()
        {
            var all = catalog.Documents.All().ToList();
            return all.Count == 0 ? null : Pick(all);
        }

        /// <summary>Adds or changes a document: live with 1–4 page keys from a shared pool, or quarantined (readable type or not).</summary>
        private void Put(string id)
        {
            var root = id[..id.IndexOf('\0', StringComparison.Ordinal)];
            var path = id[(root.Length + 1)..];
            var old = catalog.Documents.Find(root, path);
            var quarantined = random.Next(6) == 0;
            var record = new DocumentRecord
            {
                Id = id,
                Root = root,
                Path = quarantined && random.Next(2) == 0 ? Path.ChangeExtension(path, ".xyz") : path,
                Size = random.Next(1, 100_000),
                State = quarantined ? DocumentState.Quarantined : DocumentState.Live,
                QuarantineReason = quarantined ? QuarantineReason.Unsupported : null,
                Kind = Pick([DocumentKind.Pdf, DocumentKind.Png, DocumentKind.PlainText]),
                PageKeys = quarantined ? [] : Enumerable.Range(0, random.Next(1, 5)).Select(_ => $"p{random.Next(60):00}").ToList(),
            };
            var edit = new CatalogEdit();
            edit.PutDocuments.Add(record);
            Reference(edit, old, record);
            catalog.Apply(edit);
        }

        private void Delete(DocumentRecord? document)
        {
            if (document is null)
            {
                return;
            }

            var edit = new CatalogEdit();
            edit.DeleteDocuments.Add(document.Id);
            Reference(edit, document, null);
            catalog.Apply(edit);
        }

        /// <summary>Same bytes at a new path of the same root: one edit deletes and puts, the pages keep their counts.</summary>
        private void Move(DocumentRecord? document)
        {
            if (document is null)
            {
                return;
            }

            var path = $"moved/{random.Next(1000)}-{document.Path}";
            var id = DocumentRecord.MakeId(document.Root, path);
            if (catalog.Documents.Find(document.Root, path) is not null)
            {
                return;
            }

            var edit = new CatalogEdit();
            edit.DeleteDocuments.Add(document.Id);
            edit.PutDocuments.Add(new DocumentRecord { Id = id, Root = document.Root, Path = path, Size = document.Size, State = document.State, QuarantineReason = document.QuarantineReason, PageKeys = document.PageKeys });
            catalog.Apply(edit);
        }

        /// <summary>Moves reference counts from <paramref name="old"/>'s pages to <paramref name="now"/>'s, queueing pages seen the first time.</summary>
        private void Reference(CatalogEdit edit, DocumentRecord? old, DocumentRecord? now)
        {
            var change = new Dictionary<string, int>(StringComparer.Ordinal);
            foreach (var key in old is { State: DocumentState.Live } ? old.PageKeys : [])
            {
                change[key] = change.GetValueOrDefault(key) - 1;
            }

            foreach (var key in now is { State: DocumentState.Live } ? now.PageKeys : [])
            {
                change[key] = change.GetValueOrDefault(key) + 1;
            }

            foreach (var (key, delta) in change.Where(c => c.Value != 0))
            {
                if (catalog.Pages.Find(key) is { } page)
                {
                    edit.SetReferences.Add((key, page.References + delta));
                    if (page.References + delta > 0 && catalog.VectorSets.Find(Active, key) is not { Live: true } && page.References <= 0)
                    {
                        edit.Enqueue.Add(new QueueRecord { Id = key, Priority = QueuePriority.Fresh, EnqueuedUtc = at, NotBeforeUtc = at });
                    }
                }
                else if (delta > 0)
                {
                    edit.AddPages.Add(new PageRecord { Id = key, References = delta });
                    if (catalog.VectorSets.Find(Active, key) is null)
                    {
                        edit.Enqueue.Add(new QueueRecord { Id = key, Priority = QueuePriority.Fresh, EnqueuedUtc = at, NotBeforeUtc = at });
                    }
                }
            }
        }

        private void Embed()
        {
            var due = catalog.Queue.Next(random.Next(1, 6), at.AddDays(1));
            if (due.Count == 0)
            {
                return;
            }

            var segment = new SegmentRecord { Id = catalog.Segments.AllocateId(), EncoderId = Active, Dimensions = 4, CreatedUtc = at };
            var sets = due.Select((q, i) => new VectorSetRecord
            {
                Id = VectorSetRecord.MakeId(Active, q.Id),
                EncoderId = Active,
                PageKey = q.Id,
                SegmentId = segment.Id,
                Offset = 112 + (i * 64L),
                Length = 64,
                VectorCount = 4,
            }).ToList();
            segment.Length = 112 + (sets.Count * 64L);
            catalog.CommitEmbedded(segment, sets, due.Select(q => q.Id).ToList());
        }

        /// <summary>One segment's live sets copied into a new one, its dead ones forgotten.</summary>
        private void Compact()
        {
            var segments = catalog.Segments.All();
            if (segments.Count == 0)
            {
                return;
            }

            var old = Pick(segments);
            var target = new SegmentRecord { Id = catalog.Segments.AllocateId(), EncoderId = old.EncoderId, Dimensions = old.Dimensions, Sealed = true, CreatedUtc = at };
            var moves = new Dictionary<(long SegmentId, long Offset), (long SegmentId, long Offset)>();
            foreach (var set in catalog.VectorSets.OfSegment(old.Id).Where(s => s.Live))
            {
                moves[(old.Id, set.Offset)] = (target.Id, 112 + (moves.Count * 64L));
                target.RecordCount++;
                target.LiveRecordCount++;
                target.LiveBytes += set.Length;
            }

            target.Length = 112 + (moves.Count * 64L);
            catalog.SwapCompacted([old.Id], [target], moves);
        }

        private void ForgetSomeVectors()
        {
            var live = catalog.VectorSets.Live(Active);
            if (live.Count > 0)
            {
                catalog.ForgetVectorSets([Pick(live)], []);
            }
        }

        /// <summary>Every document of the root goes, then the pages no one holds (as forget-root and the end of a scan do).</summary>
        private void ForgetRoot(string root)
        {
            var edit = new CatalogEdit();
            var counts = new Dictionary<string, int>(StringComparer.Ordinal);
            foreach (var document in catalog.Documents.OfRoot(root).ToList())
            {
                edit.DeleteDocuments.Add(document.Id);
                foreach (var key in document.State == DocumentState.Live ? document.PageKeys : [])
                {
                    counts[key] = counts.GetValueOrDefault(key) + 1;
                }
            }

            foreach (var (key, count) in counts)
            {
                edit.SetReferences.Add((key, catalog.Pages.Find(key)!.References - count));
            }

            catalog.Apply(edit);
            catalog.RemoveUnreferencedPages();
        }

        /// <summary>A queue entry failing for good, or an edit that fails half-way and is rolled back whole.</summary>
        private void QuarantineOrRollBack()
        {
            if (random.Next(2) == 0 && catalog.Queue.Keys() is { Count: > 0 } keys)
            {
                // Quarantined, or backing off for up to two days (Due is asked at several times).
                var backOff = random.Next(3) == 0 ? (DateTime?)null : at.AddHours(random.Next(1, 48));
                catalog.Queue.RecordFailure(Pick(keys).PageKey, _ => backOff, "test failure", at);
                return;
            }

            var edit = new CatalogEdit();
            edit.PutDocuments.Add(new DocumentRecord { Id = DocumentRecord.MakeId("north", "half.pdf"), Root = "north", Path = "half.pdf", State = DocumentState.Live, PageKeys = ["p99"] });
            edit.AddPages.Add(new PageRecord { Id = "p99", References = 1 });
            edit.Enqueue.Add(null!);
            Assert.ThrowsAny<Exception>(() => catalog.Apply(edit));
        }

        /// <summary>Once: every referenced page queued for the second encoder; later, when it covers them all, the switch-over retiring the first.</summary>
        private void Migrate()
        {
            if (!migrated)
            {
                migrated = true;
                Active = Second;
                catalog.ApplyDrift(catalog.Pages.ReferencedKeys().ToList(), [], null, at);
                return;
            }

            if (catalog.Encoders.ServingId() is null && catalog.Queue.Depths()[QueuePriority.Migration] == 0)
            {
                catalog.ApplyDrift([], [First], Second, at);
            }
        }
    }
}
