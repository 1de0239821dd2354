using System.Diagnostics;
using IndexKeeper.Core.Detect;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// No-change rescan: walk + quick check of every file, against walk + re-hash of every byte, on the same
/// tree in the same run. Warm figures always; cold ones (page cache, dentries and inodes dropped) when the
/// process may write /proc/sys/vm/drop_caches.
/// </summary>
public sealed class RescanBenchmark : IBenchmark
{
    private const int Repeats = 3;

    public string Name => "rescan";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        var fileCount = context.Quick ? 300 : 5_000;
        var root = Path.Combine(context.WorkDirectory, "store");
        var bytes = Generate(root, fileCount);
        context.Report("files", fileCount, "files");
        context.Report("bytes", bytes / 1e6, "MB");

        // Stats taken within the racy window after a write cannot vouch for a file (QuickCheck.Racy), and a
        // real store was written long before it is rescanned: let the window pass before the first scan.
        Thread.Sleep(QuickCheck.DefaultRacyWindow + TimeSpan.FromMilliseconds(200));

        var spec = new RootSpec("store", root, ["**/*.pdf"], []);
        var walker = RootWalker.Create();
        var hasher = FileHasher.Create();
        var catalog = new Dictionary<string, StoredFileState>(StringComparer.Ordinal);
        var initial = Stopwatch.StartNew();
        foreach (var file in walker.Walk(spec, Fail))
        {
            var result = hasher.Hash(file, CancellationToken.None);
            catalog[file.RelativePath] = result.Stable
                ? new StoredFileState(result.After, result.Sha256, result.CheckedAtTicksUtc)
                : throw new InvalidOperationException($"{file.RelativePath}: {result.Detail}");
        }

        context.Report("initial scan (walk + hash), warm", initial.Elapsed.TotalSeconds, "s");

        var (quick, quickCpu) = Median(() => QuickRescan(walker, spec, catalog));
        var (full, fullCpu) = Median(() => FullRehash(walker, hasher, spec, catalog));
        context.Report("no-change rescan, walk + quick check, warm", quick, "s");
        context.Report("no-change rescan, walk + re-hash, warm", full, "s");
        context.Report("ratio re-hash / quick check, warm", full / quick, "x");
        // CPU time of this process: on a shared machine it moves less with other people's load than wall time.
        context.Report("no-change rescan, walk + quick check, warm, cpu", quickCpu, "s");
        context.Report("no-change rescan, walk + re-hash, warm, cpu", fullCpu, "s");
        context.Report("ratio re-hash / quick check, warm, cpu", fullCpu / quickCpu, "x");
        context.Report("quick check rate, warm", fileCount / quick, "files/s");
        context.Report("re-hash rate, warm", bytes / 1e6 / full, "MB/s");
        context.Report("re-hash rate, warm, cpu", bytes / 1e6 / fullCpu, "MB/s");
        
        if (Measure.TryDropCaches(out var reason))
        {
            var coldQuick = Measure.Cold(() => QuickRescan(walker, spec, catalog));
            var coldFull = Measure.Cold(() => FullRehash(walker, hasher, spec, catalog));
            context.Report("no-change rescan, walk + quick check, cold", coldQuick, "s");
            context.Report("no-change rescan, walk + re-hash, cold", coldFull, "s");
            context.Report("ratio re-hash / quick check, cold", coldFull / coldQuick, "x");
        }
        else
        {
            context.Note("cold figures not taken: cannot drop the page cache (" + reason + ")");
        }

        context.Note($"median of {Repeats} warm runs; goal: ratio >= 20x");
    }

    private static long Generate(string root, int fileCount)
    {
        var random = new Random(7717);
        long total = 0;
        var buffer = new byte[200 * 1024];
        for (var i = 0; i < fileCount; i++)
        {
            // 50 files per folder, folders two levels deep, like a store of reports by site and year.
            var folder = Path.Combine(root, $"site-{i / 500:D2}", $"year-{(i / 50) % 10:D2}");
            Directory.CreateDirectory(folder);
            var size = random.Next(20 * 1024, (200 * 1024) + 1);
            random.NextBytes(buffer.AsSpan(0, size));
            File.WriteAllBytes(Path.Combine(folder, $"report-{i:D5}.pdf"), buffer.AsSpan(0, size).ToArray());
            total += size;
        }

        return total;
    }

    private static void QuickRescan(IRootWalker walker, RootSpec spec, Dictionary<string, StoredFileState> catalog)
    {
        var seen = 0;
        foreach (var file in walker.Walk(spec, Fail))
        {
            catalog.TryGetValue(file.RelativePath, out var stored);
            if (QuickCheck.BeforeHash(stored, file.Stat).Verdict != QuickCheckVerdict.Unchanged)
            {
                throw new InvalidOperationException($"{file.RelativePath} flagged on a no-change rescan");
            }

            seen++;
        }

        Check(seen, catalog);
    }

    private static void FullRehash(IRootWalker walker, IFileHasher hasher, RootSpec spec, Dictionary<string, StoredFileState> catalog)
    {
        var seen = 0;
        foreach (var file in walker.Walk(spec, Fail))
        {
            var result = hasher.Hash(file, CancellationToken.None);
            if (QuickCheck.AfterHash(catalog[file.RelativePath], result) != HashVerdict.Unchanged)
            {
                throw new InvalidOperationException($"{file.RelativePath} changed on a no-change rescan");
            }

            seen++;
        }

        Check(seen, catalog);
    }

    private static void Check(int seen, Dictionary<string, StoredFileState> catalog)
    {
        if (seen != catalog.Count)
        {
            throw new InvalidOperationException($"walk saw {seen} files, the catalog holds {catalog.Count}");
        }
    }

    /// <summary>Median wall and CPU seconds of <see cref="Repeats"/> runs after one warm-up (JIT, caches).</summary>
    private static (double Wall, double Cpu) Median(Action run)
    {
        run();
        var walls = new List<double>();
        var cpus = new List<double>();
        using var self = Process.GetCurrentProcess();
        for (var i = 0; i < Repeats; i++)
        {
            self.Refresh();
            var cpuBefore = self.TotalProcessorTime;
            var watch = Stopwatch.StartNew();
            run();
            walls.Add(watch.Elapsed.TotalSeconds);
            self.Refresh();
            cpus.Add((self.TotalProcessorTime - cpuBefore).TotalSeconds);
        }

        walls.Sort();
        cpus.Sort();
        return (walls[Repeats / 2], cpus[Repeats / 2]);
    }

    private static void Fail(WalkProblem problem) =>
        throw new InvalidOperationException($"unexpected walk problem: {problem.Kind} {problem.RelativePath}: {problem.Detail}");
}
