using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// No-change rescan of a tree of real PDFs through the real scan pass and catalog, against re-hashing
/// every byte of the same tree in the same run (issue 2's goal: at least 20× faster). A third figure, a
/// rescan after every file was touched (same bytes, new modification time), is what the pass costs when
/// the quick check cannot vouch for any file.
/// </summary>
public sealed class ScanBenchmark : IBenchmark
{
    private const int Repeats = 3;

    public string Name => "scan";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        var documents = context.Quick ? 100 : 5_000;
        var root = Path.Combine(context.WorkDirectory, "store");
        var (generated, _) = Measure.Once(() => Generate(root, documents));
        var files = Directory.GetFiles(root, "*.pdf", SearchOption.AllDirectories);
        var bytes = files.Sum(f => new FileInfo(f).Length);
        context.Note($"{documents} generated PDFs of 1-5 pages in {generated:0.0} s; modification times set an hour back");
        context.Report("documents", documents, "files");
        context.Report("bytes in the tree", bytes / 1e6, "MB");
        context.Report("mean file size", bytes / 1e3 / documents, "kB");

        var spec = new RootSpec("store", root, ["**/*.pdf"], []);
        var settings = new ScanSettings([spec], ReadLimits.Default, TimeSpan.FromSeconds(2));
        using var heldLock = IndexLock.Acquire(Path.Combine(context.WorkDirectory, "index"), "benchmark scan");
        using var catalog = IndexCatalog.Open(heldLock);
        using var words = PageWordStore.OpenForWriting(heldLock.Directory);
        var pass = new ScanPass(catalog, words, DocumentReaderFactory.Create(), settings);

        ScanSummary first = null!;
        var (initialWall, initialCpu) = Measure.Once(() => first = pass.Run("benchmark", CancellationToken.None));
        if (first.DocumentsNew != documents || first.DocumentsQuarantined != 0)
        {
            throw new InvalidOperationException($"first scan took {first.DocumentsNew} new and {first.DocumentsQuarantined} quarantined of {documents}");
        }

        context.Report("pages", first.PagesSeen, "pages");
        context.Report("first scan (walk, hash, read, page keys, catalog)", initialWall, "s");
        context.Report("first scan, cpu", initialCpu, "s");
        context.Report("first scan rate", first.PagesSeen / initialWall, "pages/s");

        var (rescan, rescanCpu) = Measure.Median(Repeats, () => Expect(pass.Run("benchmark", CancellationToken.None), documents, hashed: 0));
        var (walkOnly, walkOnlyCpu) = Measure.Median(Repeats, () => Walk(spec, hasher: null, documents));
        var hasher = FileHasher.Create();
        var (rehash, rehashCpu) = Measure.Median(Repeats, () => Walk(spec, hasher, documents));
        var touch = 0;
        var (touched, touchedCpu) = Measure.Median(
            Repeats,
            () => Expect(pass.Run("benchmark", CancellationToken.None), documents, hashed: documents),
            prepare: () => Touch(files, ++touch));

        // Where a no-change rescan spends its time: the catalog calls it makes, each timed alone.
        var ids = files.Select(f => Path.GetRelativePath(root, f).Replace(Path.DirectorySeparatorChar, '/')).ToList();
        var (lookups, _) = Measure.Median(Repeats, () => ids.ForEach(id => _ = catalog.Documents.Find("store", id) ?? throw new InvalidOperationException(id)));
        var (listing, _) = Measure.Median(Repeats, () => _ = catalog.Documents.OfRoot("store").Count());
        var (unreferenced, _) = Measure.Median(Repeats, () => _ = catalog.RemoveUnreferencedPages());
        var (listed, listedCpu) = Measure.Median(Repeats, () => QuickCheckAgainstListing(catalog, spec, documents));

        context.Report("no-change rescan (scan pass: walk, quick check, catalog)", rescan, "s");
        context.Report("walk + re-hash every byte (baseline)", rehash, "s");
        context.Report("ratio re-hash / no-change rescan", rehash / rescan, "x");
        context.Report("rescan after touching every file (scan pass, hashes all)", touched, "s");
        context.Report("ratio touched rescan / no-change rescan", touched / rescan, "x");
        context.Report("walk + stat only, no catalog (floor of any rescan)", walkOnly, "s");
        context.Report("walk + quick check against the root's documents listed once (not the pass)", listed, "s");
        context.Report("ratio re-hash / quick check against one listing", rehash / listed, "x");
        context.Report("  catalog calls of the pass, timed alone: one document lookup per file", lookups, "s");
        context.Report("  catalog calls of the pass, timed alone: listing the root's documents (deletions)", listing, "s");
        context.Report("  catalog calls of the pass, timed alone: removing unreferenced pages (none)", unreferenced, "s");
        context.Report("no-change rescan, cpu", rescanCpu, "s");
        context.Report("walk + re-hash every byte, cpu", rehashCpu, "s");
        context.Report("ratio re-hash / no-change rescan, cpu", rehashCpu / rescanCpu, "x");
        context.Report("touched rescan, cpu", touchedCpu, "s");
        context.Report("walk + stat only, cpu", walkOnlyCpu, "s");
        context.Report("walk + quick check against one listing, cpu", listedCpu, "s");
        if (Measure.TryDropCaches(out var reason))
        {
            // A nightly rescan of a large store finds little of it in the page cache; the catalog is cold too.
            var coldRescan = Measure.Cold(() => Expect(pass.Run("benchmark", CancellationToken.None), documents, hashed: 0));
            var coldRehash = Measure.Cold(() => Walk(spec, hasher, documents));
            context.Report("no-change rescan, cold caches", coldRescan, "s");
            context.Report("walk + re-hash every byte, cold caches", coldRehash, "s");
            context.Report("ratio re-hash / no-change rescan, cold caches", coldRehash / coldRescan, "x");
        }
        else
        {
            context.Note("cold figures not taken: cannot drop the page cache (" + reason + ")");
        }

        context.Report("no-change rescan, per document", rescan / documents * 1e6, "µs");
        context.Report("re-hash, per document", rehash / documents * 1e6, "µs");
        context.Report("re-hash rate", bytes / 1e6 / rehash, "MB/s");
        context.Note($"times are medians of {Repeats} warm runs after a warm-up; goal: ratio >= 20x");
    }

    private static void Generate(string root, int documents)
    {
        var hourAgo = DateTime.UtcNow.AddHours(-1);
        Parallel.For(0, documents, new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount }, d =>
        {
            // 50 reports per folder, two levels deep, like a store of reports by site and year.
            var folder = Path.Combine(root, $"site-{d / 500:D2}", $"year-{d / 50 % 10:D2}");
            Directory.CreateDirectory(folder);
            var pages = 1 + (d * 7 % 5);
            var path = Path.Combine(folder, $"report-{d:D5}.pdf");
            File.WriteAllBytes(path, GeneratedReport.Build(d, new int[pages], wordsPerPage: 60));
            // Stats taken within the racy window of a write cannot vouch for a file (docs/detect.md), and a
            // real store was written long before it is rescanned.
            File.SetLastWriteTimeUtc(path, hourAgo);
        });
    }

    /// <summary>
    /// A design the pass could take, measured for comparison: one read of the root's documents (which
    /// the pass makes anyway to find deletions), then the quick check of each walked file against it.
    /// </summary>
    private static void QuickCheckAgainstListing(IndexCatalog catalog, RootSpec spec, int documents)
    {
        var stored = catalog.Documents.OfRoot(spec.Name).ToDictionary(d => d.Path, StoredState.Of, StringComparer.Ordinal);
        var unchanged = RootWalker.Create().Walk(spec, p => throw new InvalidOperationException($"walk problem: {p.Kind} {p.RelativePath}"))
            .Count(f => QuickCheck.BeforeHash(stored.GetValueOrDefault(f.RelativePath), f.Stat).Verdict == QuickCheckVerdict.Unchanged);
        if (unchanged != documents)
        {
            throw new InvalidOperationException($"{unchanged} of {documents} files passed the quick check");
        }
    }

    /// <summary>New modification times (still an hour back, so not racy), same bytes.</summary>
    private static void Touch(string[] files, int round)
    {
        var when = DateTime.UtcNow.AddHours(-1).AddSeconds(round);
        foreach (var file in files)
        {
            File.SetLastWriteTimeUtc(file, when);
        }
    }

    private static void Expect(ScanSummary summary, int documents, long hashed)
    {
        if (summary.DocumentsUnchanged != documents || summary.FilesHashed != hashed || summary.DocumentsRead != 0)
        {
            throw new InvalidOperationException(
                $"rescan: {summary.DocumentsUnchanged} unchanged, {summary.FilesHashed} hashed, {summary.DocumentsRead} read; expected {documents}, {hashed}, 0");
        }
    }

    /// <summary>The baseline: the same walk, and a streaming SHA-256 of every file when a hasher is given.</summary>
    private static void Walk(RootSpec spec, IFileHasher? hasher, int documents)
    {
        var seen = 0;
        foreach (var file in RootWalker.Create().Walk(spec, p => throw new InvalidOperationException($"walk problem: {p.Kind} {p.RelativePath}")))
        {
            if (hasher is not null && !hasher.Hash(file, CancellationToken.None).Stable)
            {
                throw new InvalidOperationException($"{file.RelativePath} was not stable while hashed");
            }

            seen++;
        }

        if (seen != documents)
        {
            throw new InvalidOperationException($"walk saw {seen} files of {documents}");
        }
    }
}
