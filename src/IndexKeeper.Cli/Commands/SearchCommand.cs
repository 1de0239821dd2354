using System.Globalization;
using IndexKeeper.Cli.CommandLine;
using IndexKeeper.Cli.Output;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Querying;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>search "text" [-k N] [--maps DIR]</c>: top-k pages by late interaction, with what matched where.</summary>
internal sealed class SearchCommand() : CommandBase(
    "search",
    "top-k pages for a query by MaxSim over live vector sets; --maps DIR draws match maps", "k", "maps")
{
    public override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        var text = string.Join(' ', context.Arguments.Positional).Trim();
        if (text.Length == 0)
        {
            throw new UsageException("search needs a query, e.g. indexkeeper search \"valve inspection interval\".");
        }

        var k = 10;
        if (context.Arguments.Named.TryGetValue("k", out var kText) && !int.TryParse(kText, NumberStyles.None, CultureInfo.InvariantCulture, out k))
        {
            throw new UsageException($"-k {kText}: give a whole number.");
        }

        var options = context.LoadForExistingIndex();
        if (QueryCaps.Problem(text, k, options.Query) is { } problem)
        {
            throw new UsageException(problem);
        }

        var report = ThroughDaemon.Ask(options, () =>
        {
            using var composed = CommandContext.OpenForReading(options);
            var found = composed.Get<SearchOperation>().Search(text, k, cancellationToken);
            if (context.Arguments.Named.TryGetValue("maps", out var mapsDirectory))
            {
                MatchMaps.Write(composed.Index.Catalog, found, mapsDirectory);
            }

            return found;
        }, daemon => context.Arguments.Named.ContainsKey("maps")
            ? throw new UsageException("--maps draws from the index itself, which the running daemon holds; search without --maps, or stop the daemon.")
            : daemon.Get<SearchReport>(string.Create(CultureInfo.InvariantCulture, $"/api/search?q={Uri.EscapeDataString(text)}&k={k}")));

        // A search that could not read every vector set is a partial failure (exit 1), said on stderr.
        if (report.VectorSetsUnreadable > 0)
        {
            Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture, $"warning: {report.VectorSetsUnreadable} vector set(s) could not be read, so their pages could not be found; run `indexkeeper verify` (docs/recovery.md)."));
        }

        return context.Print(report, Write, report.VectorSetsUnreadable > 0 ? 1 : 0);
    }

    private static void Write(TextWriter o, SearchReport report)
    {
        var c = CultureInfo.InvariantCulture;
        o.WriteLine(string.Create(c, $"{report.Hits.Count} hit(s) for \"{report.Query}\" ({report.QueryVectors} query vectors, {report.PagesScanned} pages, {report.ElapsedMilliseconds:0.0} ms)"));
        if (report.Notice is { } notice)
        {
            o.WriteLine("note: " + notice);
        }

        var rank = 0;
        foreach (var hit in report.Hits)
        {
            var words = string.Join(", ", hit.Matches.Where(m => m.Word is not null && m.Similarity > 0.5).Select(m => m.Word).Distinct().Take(6));
            o.WriteLine(string.Create(c, $"{++rank,3}. {hit.Score,8:0.000}  {hit.Root}/{hit.Path}  page {hit.Page}{(hit.AlsoAt.Count > 0 ? $"  (+{hit.AlsoAt.Count} copies)" : string.Empty)}"));
            if (words.Length > 0)
            {
                o.WriteLine("               matched: " + words);
            }
        }
    }
}
