
namespace IndexKeeper.Benchmarks;

/// <summary>
/// Runs benchmarks and writes their figures to artifacts/benchmarks/NAME.json.
/// Usage: <c>dotnet run -c Release --project tests/IndexKeeper.Benchmarks -- [--quick] [NAME ...]</c>
/// </summary>
internal static class Program
{
    private static int Main(string[] args)
    {
        var quick = args.Contains("--quick");
        var names = args.Where(a => !a.StartsWith("--", StringComparison.Ordinal)).ToHashSet(StringComparer.OrdinalIgnoreCase);
        var all = typeof(Program).Assembly.GetTypes()
            .Where(t => typeof(IBenchmark).IsAssignableFrom(t) && t is { IsAbstract: false, IsInterface: false })
            .Select(t => (IBenchmark)Activator.CreateInstance(t)!)
            .OrderBy(b => b.Name, StringComparer.Ordinal)
            .ToList();
        var chosen = names.Count == 0 ? all : all.Where(b => names.Contains(b.Name)).ToList();
        if (chosen.Count == 0)
        {
            Console.Error.WriteLine("unknown benchmark; known: " + string.Join(", ", all.Select(b => b.Name)));
            return 2;
        }

        var outDir = Path.Combine(FindRepositoryRoot(), "artifacts", "benchmarks");
        Directory.CreateDirectory(outDir);
        foreach (var benchmark in chosen)
        {
            var work = Path.Combine(Path.GetTempPath(), "indexkeeper-bench-" + benchmark.Name + "-" + Environment.ProcessId);
            Directory.CreateDirectory(work);
            try
            {
                Console.WriteLine($"== {benchmark.Name}{(quick ? " (quick)" : string.Empty)}");
                var context = new BenchmarkContext(benchmark.Name, work, quick);
                var (wall, _) = Measure.Once(() => benchmark.Run(context));
                var loadAtEnd = Measure.LoadAverage();
                Console.WriteLine(FormattableString.Invariant($"  # {wall:0.0} s; load average (1 min) {context.LoadAtStart:0.00} at start, {loadAtEnd:0.00} at end"));
                File.WriteAllText(Path.Combine(outDir, benchmark.Name + ".json"), context.ToJson(wall, loadAtEnd));
            }
            finally
            {
                Directory.Delete(work, recursive: true);
            }
        }

        Console.WriteLine($"figures written to {outDir}");
        return 0;
    }

    private static string FindRepositoryRoot()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "IndexKeeper.sln")))
        {
            dir = dir.Parent;
        }

        return dir?.FullName ?? Directory.GetCurrentDirectory();
    }
}
