using System.Diagnostics;
using IndexKeeper.Churn.Report;
using IndexKeeper.Churn.Store;
using IndexKeeper.Churn.Strategies;

namespace IndexKeeper.Churn;

/// <summary>
/// Plays a month on the simulated drive and measures the three strategies on the same days: (a) a nightly
/// full re-embed of every page, (b) a re-embed of every page of each file whose bytes changed, (c) the
/// real IndexKeeper. The first day (day 0) is the first build; each later day is that day's changes,
/// then one sync and compaction of (c), then an audit of (c) against the truth.
/// </summary>
internal sealed class ChurnSimulation(ChurnProfile profile, int seed, string workDirectory, Action<string> log)
{
    public const int Dimensions = 128;

    /// <summary>The mid-month encoder change: the hashed-term encoder with another output size, so another encoder id.</summary>
    public const int ChangedDimensions = 192;

    public MonthReport Run()
    {
        var total = Stopwatch.StartNew();
        var root = Path.Combine(workDirectory, "drive");
        var store = new StoreModel(root, Path.Combine(workDirectory, "scratch"));
        var script = new ChangeScript(profile, seed, store);
        var keeper = new KeeperIndex(Path.Combine(workDirectory, "index"), root);
        var audit = new IndexAudit();

        script.Generate();
        var generateSeconds = total.Elapsed.TotalSeconds;
        log($"day 0: {store.Paths.Count} files, {store.PageCount} pages generated in {generateSeconds:0.0} s");

        var days = new List<(DayFigures Figures, double KeeperEncoderSeconds)>();
        var previousContents = new HashSet<ulong>();
        var previousHashes = new Dictionary<string, string>(StringComparer.Ordinal);
        var dimensions = Dimensions;
        for (var day = 0; day <= profile.Days; day++)
        {
            var changes = day == 0 ? new SortedDictionary<string, int>(StringComparer.Ordinal) { ["first build"] = store.Paths.Count } : script.Apply(day);
            var encoderChange = day == profile.EncoderChangeDay;
            if (encoderChange)
            {
                dimensions = ChangedDimensions;
                changes["encoder change (full re-embed)"] = 1;
            }

            var truth = store.Truth();
            var hashes = store.FileHashes();
            var contents = truth.Values.SelectMany(p => p).ToHashSet();
            var changed = encoderChange ? contents : contents.Where(c => !previousContents.Contains(c)).ToHashSet();

            var synced = keeper.Sync(dimensions, compact: true);
            AuditResult checkedDay;
            using (var composed = keeper.Open(dimensions, "churn audit"))
            {
                checkedDay = audit.Check(composed.Index, truth, changed);
            }

            var pages = truth.Values.Sum(p => (long)p.Count);
            var changedFiles = truth.Keys.Where(p => encoderChange || !previousHashes.TryGetValue(p, out var h) || h != hashes[p]).ToList();
            var fileCalls = changedFiles.Sum(p => (long)truth[p].Count);
            var fileBytes = changedFiles.Sum(p => checkedDay.BytesByPath[p]);
            var segmentBytes = keeper.SegmentBytesOnDisk();
            var figures = new DayFigures(
                day,
                day == 0 ? "first build" : profile.DayType(day),
                changes,
                truth.Count,
                pages,
                contents.Count,
                changed.Count,
                new StrategyDay(pages, 0, 0, checkedDay.ServedBytes, checkedDay.ServedBytes, 0, 0),
                new StrategyDay(fileCalls, 0, 0, fileBytes, checkedDay.ServedBytes, 0, 0),
                new StrategyDay(synced.Summary.PagesEmbedded, synced.Summary.EncoderSeconds, 0, synced.BytesEmbedded + synced.BytesCompacted, keeper.BytesOnDisk(), checkedDay.Misses, checkedDay.StaleServed),
                checkedDay.Unserved,
                checkedDay.SplitContents,
                checkedDay.LiveBytes,
                segmentBytes,
                checkedDay.LiveBytes == 0 ? double.NaN : segmentBytes / (double)checkedDay.LiveBytes,
                synced.ScanSeconds,
                synced.SyncSeconds,
                synced.Summary.DocumentsRead,
                synced.Summary.PagesReused);
            days.Add((figures, synced.Summary.EncoderSeconds));
            log($"day {day,2} {figures.DayType,-15} files {truth.Count,5} pages {pages,6} new contents {changed.Count,5} | calls (a) {pages,6} (b) {fileCalls,6} (c) {synced.Summary.PagesEmbedded,6} | misses {checkedDay.Misses} unserved {checkedDay.Unserved} (rebound keys {checkedDay.Rebound}) stale {checkedDay.StaleServed} split {checkedDay.SplitContents} | sync {synced.SyncSeconds:0.0} s");

            previousContents = contents;
            previousHashes = hashes;
        }

        var keeperCalls = days.Sum(d => d.Figures.IndexKeeper.EncoderCalls);
        var hashedPerPage = keeperCalls == 0 ? double.NaN : days.Sum(d => d.KeeperEncoderSeconds) / keeperCalls;
        double miniLmPerPage;
        int miniLmPages;
        using (var composed = keeper.Open(dimensions, "churn minilm sample"))
        {
            (miniLmPerPage, miniLmPages) = MiniLmTiming.Measure(composed.Index, profile.MiniLmSamplePages);
        }

        log($"encoder seconds per page: hashed terms {hashedPerPage * 1000:0.000} ms (mean of (c)'s calls), minilm {miniLmPerPage * 1000:0.0} ms ({miniLmPages} pages)");
        var priced = days.Select(d => d.Figures with
        {
            FullReembed = Price(d.Figures.FullReembed, hashedPerPage, miniLmPerPage),
            FileHashing = Price(d.Figures.FileHashing, hashedPerPage, miniLmPerPage),
            IndexKeeper = d.Figures.IndexKeeper with { MiniLmSeconds = d.Figures.IndexKeeper.EncoderCalls * miniLmPerPage },
        }).ToList();

        log("rebuilding from scratch over the final store");
        var rebuild = RebuildComparer.Compare(keeper, new KeeperIndex(Path.Combine(workDirectory, "rebuild"), root), dimensions, profile.Queries, seed);
        log($"rebuild: {rebuild.RebuildKeys} keys vs {rebuild.IncrementalKeys}; {rebuild.VectorSetsCompared} vector sets compared, {rebuild.VectorSetsDiffering} differ; {rebuild.QueriesDiffering} of {rebuild.Queries} queries differ");
        foreach (var difference in rebuild.Differences)
        {
            log("  " + difference);
        }

        return new MonthReport(
            profile.Name,
            seed,
            $"{Environment.ProcessorCount} cores, {Environment.OSVersion}, .NET {Environment.Version}",
            $"day {profile.EncoderChangeDay}: hashed-terms d={Dimensions} -> d={ChangedDimensions} (a new encoder id); no migration stage on main yet, so every strategy re-embeds every page that day",
            hashedPerPage,
            miniLmPerPage,
            miniLmPages,
            priced,
            rebuild,
            generateSeconds,
            total.Elapsed.TotalSeconds);
    }

    private static StrategyDay Price(StrategyDay day, double hashedPerPage, double miniLmPerPage) =>
        day with { HashedTermSeconds = day.EncoderCalls * hashedPerPage, MiniLmSeconds = day.EncoderCalls * miniLmPerPage };
}
