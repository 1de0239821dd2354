using System.CommandLine;
using System.Globalization;
using IndexKeeper.Cli.CommandLine;
using IndexKeeper.Cli.Output;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Querying;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>search "text" [-k N] [--maps DIR]</c>: top-k pages by late interaction, with what matched where.</summary>
internal sealed class SearchCommand() : CommandBase(
    "search",
    "top-k pages for a query by MaxSim over live vector sets; --maps DIR draws match maps")
{
    private readonly Argument<string[]> query = new("text")
    {
        Description = "the query; several words may be given as one quoted argument or as several",
        Arity = ArgumentArity.OneOrMore,
    };

    private readonly Option<int> k = LastValue.WinsPositive(new("-k")
    {
        Description = "how many pages to return (at most Query:MaxResults)",
        HelpName = "N",
        DefaultValueFactory = _ => 10,
    });

    private readonly Option<string?> maps = LastValue.Wins(new("--maps")
    {
        Description = "draw one PNG per hit into this folder: the page's words and the region each query vector matched",
        HelpName = "DIR",
    });

    public override IEnumerable<Symbol> Symbols => [query, k, maps];

    public override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        var text = string.Join(' ', context.Value(query) ?? []).Trim();
        if (text.Length == 0)
        {
            throw new UsageException("search needs a query, e.g. indexkeeper search \"valve inspection interval\".");
        }

        var k = context.Value(this.k);
        var options = context.LoadForExistingIndex();
        if (QueryCaps.Problem(text, k, options.Query) is { } problem)
        {
            throw new UsageException(problem);
        }

        var report = ThroughDaemon.Ask(options, () =>
        {
            using var composed = CommandContext.OpenForReading(options);
            var found = composed.Get<SearchOperation>().Search(text, k, cancellationToken);
            if (context.Value(maps) is { } mapsDirectory)
            {
                MatchMaps.Write(composed.Index.Catalog, composed.Index.Words, found, mapsDirectory);
            }

            return found;
        }, daemon => context.Value(maps) is not null
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
