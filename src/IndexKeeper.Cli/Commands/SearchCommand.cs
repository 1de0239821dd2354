using System.CommandLine;
using System.Globalization;
using IndexKeeper.Cli.CommandLine;
using IndexKeeper.Cli.Output;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Querying;

namespace IndexKeeper.Cli.Commands;

/// <summary>
/// <c>search "text" [-k N] [--maps DIR] [filters]</c>: top-k pages by late interaction, with what matched where;
/// filters and paging as <see cref="SearchFilter"/> (a bad one is exit 2 naming it).
/// </summary>
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

    private readonly Option<string[]> inRoot = new("--in-root")
    {
        Description = "only documents of this root (by its name); repeat for more",
        HelpName = "NAME",
    };

    private readonly Option<string[]> inFolder = new("--in-folder")
    {
        Description = "only documents whose path under their root matches this glob (a folder takes all below it); repeat for more",
        HelpName = "GLOB",
    };

    private readonly Option<string[]> type = new("--type")
    {
        Description = "only documents of this type (pdf, png, jpeg, tiff, markdown, …); repeat for more",
        HelpName = "TYPE",
    };

    private readonly Option<string?> modifiedSince = LastValue.Wins(new("--modified-since")
    {
        Description = "only documents modified at or after this ISO 8601 date or time (UTC unless an offset is given)",
        HelpName = "DATE",
    });

    private readonly Option<string?> minScore = LastValue.Wins(new("--min-score")
    {
        Description = "leave out hits scoring below this",
        HelpName = "SCORE",
    });

    private readonly Option<string?> offset = LastValue.Wins(new("--offset")
    {
        Description = "skip this many hits (the next page starts at the answer's nextOffset)",
        HelpName = "N",
    });

    public override IEnumerable<Symbol> Symbols => [query, k, maps, inRoot, inFolder, type, modifiedSince, minScore, offset];

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

        var (roots, folders, types) = (context.Value(inRoot) ?? [], context.Value(inFolder) ?? [], context.Value(type) ?? []);
        var (filter, filterProblem) = SearchFilter.Parse(roots, folders, types, context.Value(modifiedSince), context.Value(minScore), context.Value(offset));
        if (filterProblem is not null)
        {
            throw new UsageException(filterProblem);
        }

        var report = ThroughDaemon.Ask(options, () =>
        {
            using var composed = CommandContext.OpenForReading(options);
            var search = composed.Get<SearchOperation>();
            if (search.UnknownRoot(filter!) is { } unknown)
            {
                throw new UsageException(unknown);
            }

            var found = search.Search(text, k, filter!, cancellationToken);
            if (context.Value(maps) is { } mapsDirectory)
            {
                var rootPaths = options.Roots.ToDictionary(r => r.Name, r => r.Path, StringComparer.Ordinal);
                foreach (var note in MatchMaps.Write(composed.Index.Catalog, composed.Index.Words, found, mapsDirectory, rootPaths))
                {
                    Console.Error.WriteLine("note: " + note);
                }
            }

            return found;
        }, daemon => context.Value(maps) is not null
            ? throw new UsageException("--maps draws from the index itself, which the running daemon holds; search without --maps, or stop the daemon.")
            : daemon.Get<SearchReport>(string.Create(CultureInfo.InvariantCulture, $"/api/search?q={Uri.EscapeDataString(text)}&k={k}") + FilterQuery(roots, folders, types, [("modified-since", context.Value(modifiedSince)), ("min-score", context.Value(minScore)), ("offset", context.Value(offset))])));

        // A search that could not read every vector set is a partial failure (exit 1), said on stderr.
        if (report.VectorSetsUnreadable > 0)
        {
            Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture, $"warning: {report.VectorSetsUnreadable} vector set(s) could not be read, so their pages could not be found; run `indexkeeper verify` (docs/recovery.md)."));
        }

        return context.Print(report, Write, report.VectorSetsUnreadable > 0 ? 1 : 0);
    }

    /// <summary>The filters as <c>/api/search</c> parameters, as given (the daemon checks them again).</summary>
    private static string FilterQuery(string[] roots, string[] folders, string[] types, (string Name, string? Value)[] singles)
    {
        var parts = roots.Select(r => ("root", r)).Concat(folders.Select(f => ("folder", f))).Concat(types.Select(t => ("type", t)))
            .Concat(singles.Where(s => s.Value is not null).Select(s => (s.Name, s.Value!)));
        return string.Concat(parts.Select(p => "&" + p.Item1 + "=" + Uri.EscapeDataString(p.Item2)));
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
            if (hit.DocumentTitle is { } title)
            {
                o.WriteLine("               title: " + title);
            }

            if (words.Length > 0)
            {
                o.WriteLine("               matched: " + words);
            }
        }
    }
}
