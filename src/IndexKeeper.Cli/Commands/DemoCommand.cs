using System.CommandLine;
using System.Globalization;
using IndexKeeper.Cli.CommandLine;
using IndexKeeper.Demo;
using IndexKeeper.Cli.Output;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Cli.Commands;

/// <summary>
/// <c>demo [--output DIR]</c>: generates the document store of an invented water utility, indexes it,
/// plays a day of typical changes (an edit, a copy, a rename, a move, a delete, a touch, a metadata-only
/// save, a new report, reordered pages), indexes again, and shows what each pass cost.
/// </summary>
internal sealed class DemoCommand() : CommandBase(
    "demo",
    "builds a demo document store (an invented water utility) and runs the main job on it")
{
    private const string Marker = ".indexkeeper-demo";

    private readonly Option<string?> output = LastValue.Wins(new("--output")
    {
        Description = "the folder for the demo store and its index (made by the demo, or by an earlier demo)",
        HelpName = "DIR",
        DefaultValueFactory = _ => "indexkeeper-demo",
    });

    public override IEnumerable<Symbol> Symbols => [output];

    public override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        var directory = Path.GetFullPath(context.Value(output)!);
        Prepare(directory);
        var storeDirectory = Path.Combine(directory, "store");
        var log = context.Json ? Console.Error : Console.Out;
        log.WriteLine($"Generating the Harrowmere Water Authority demo store in {storeDirectory} …");
        var info = DemoStore.Generate(storeDirectory);
        log.WriteLine(string.Create(CultureInfo.InvariantCulture, $"  {info.DocumentCount} documents, {info.PageCount} pages in {info.Roots.Count} roots"));

        var sources = new ConfigurationSources(
            context.ConfigFile,
            Path.Combine(directory, "index"),
            [],
            [.. DemoSettings(info), .. context.Overrides]);
        var options = OptionsLoader.Load(sources);
        using var composed = CommandContext.Open(options, Name);
        var sync = composed.Get<SyncOperation>();

        log.WriteLine();
        log.WriteLine("Day 1 — first sync of the whole store:");
        var day1 = Sync(sync, "demo day 1", cancellationToken);
        SummaryText.Write(log, day1);

        log.WriteLine();
        log.WriteLine("Day 2 — what people did to the store:");
        var changes = DemoStore.ApplyDayTwoChanges(storeDirectory);
        foreach (var change in changes)
        {
            log.WriteLine($"  - {change.Description}");
        }

        var truth = changes.Sum(c => c.PagesNew.Count);
        log.WriteLine();
        log.WriteLine("Day 2 — second sync:");
        var day2 = Sync(sync, "demo day 2", cancellationToken);
        SummaryText.Write(log, day2);
        log.WriteLine(string.Create(
            CultureInfo.InvariantCulture,
            $"  → {day2.PagesEmbedded} encoder page calls for {truth} pages whose content is new; re-embedding every page would have cost {day2.PagesSeen}."));

        var query = "chlorine residual inspection";
        var search = composed.Get<SearchOperation>().Search(query, 3, cancellationToken);
        log.WriteLine();
        log.WriteLine($"Search \"{query}\":");
        foreach (var hit in search.Hits)
        {
            log.WriteLine(string.Create(CultureInfo.InvariantCulture, $"  {hit.Score,8:0.000}  {hit.Root}/{hit.Path} page {hit.Page}"));
        }

        var status = composed.Get<StatusOperation>().Read();
        log.WriteLine();
        log.WriteLine(string.Create(
            CultureInfo.InvariantCulture,
            $"Index {status.IndexDirectory}: {status.Documents} documents, {status.Pages} pages, {status.LiveVectorSets} live vector sets of encoder {status.ActiveEncoder} in {status.Segments} segment(s), dead share {status.DeadRatio:P1}, {status.Quarantined} quarantined."));
        log.WriteLine($"Try: indexkeeper search --index {status.IndexDirectory} \"pump station maintenance\"   (and: status, encoders; plan takes the roots too: {string.Join(' ', info.Roots.Select(r => "--root " + r.Path))})");
        if (context.Json)
        {
            JsonOutput.Write(new { store = storeDirectory, index = status.IndexDirectory, day1, changes, day2, truePagesNew = truth, search, status });
        }

        return day2.PagesEmbedded == truth ? 0 : 1;
    }

    private static ScanSummary Sync(SyncOperation sync, string command, CancellationToken cancellationToken) =>
        TerminalProgress.Around(progress => sync.Run(command, progress, cancellationToken));

    /// <summary>The demo's roots, and no settle wait: the generator has finished every file it wrote.</summary>
    private static IEnumerable<string> DemoSettings(DemoStoreInfo info)
    {
        for (var i = 0; i < info.Roots.Count; i++)
        {
            yield return $"Roots:{i}:Name={info.Roots[i].Name}";
            yield return $"Roots:{i}:Path={info.Roots[i].Path}";
        }

        yield return "Detect:SettleSeconds=0";
    }

    /// <summary>Reuses a folder only if an earlier demo made it; never deletes anything else.</summary>
    private static void Prepare(string directory)
    {
        if (Directory.Exists(directory) && Directory.EnumerateFileSystemEntries(directory).Any())
        {
            if (!File.Exists(Path.Combine(directory, Marker)))
            {
                throw new UsageException($"'{directory}' exists and was not made by the demo; choose another with --output DIR.");
            }

            Directory.Delete(directory, recursive: true);
        }

        Directory.CreateDirectory(directory);
        File.WriteAllText(Path.Combine(directory, Marker), "made by indexkeeper demo; deleted and rebuilt by the next demo run\n");
    }
}
