using System.Globalization;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Querying;
using Microsoft.AspNetCore.Http;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// <c>/api/search?q=TEXT&amp;k=N</c>: one q, at most one k, both within the caps (<see cref="QueryCaps"/>), and the
/// filters of <see cref="SearchFilter"/> (<c>root</c>, <c>folder</c>, <c>type</c> repeatable; <c>modified-since</c>,
/// <c>min-score</c>, <c>offset</c> once); anything else is a 400 naming the parameter or cap, before anything is encoded. Whether the search
/// itself fails or succeeds goes to <see cref="DaemonState"/>: a daemon whose searches fail is not healthy.
/// </summary>
internal static class SearchEndpoint
{
    public static IResult Answer(
        IQueryCollection query, QueryOptions caps, Func<SearchFilter, string?> unknownRoot, Func<string, int, SearchFilter, CancellationToken, SearchReport> search, DaemonState state, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(unknownRoot);
        ArgumentNullException.ThrowIfNull(state);
        ArgumentNullException.ThrowIfNull(query);
        ArgumentNullException.ThrowIfNull(search);
        var q = query["q"];
        var kValues = query["k"];

        // A repeated parameter would otherwise be joined with commas into one odd query.
        if (q.Count > 1)
        {
            return BadRequest(string.Create(CultureInfo.InvariantCulture, $"q: give the query once; it came {q.Count} times."));
        }

        if (kValues.Count > 1)
        {
            return BadRequest(string.Create(CultureInfo.InvariantCulture, $"k: give k once; it came {kValues.Count} times."));
        }

        var text = q.Count == 1 ? q[0]!.Trim() : string.Empty;
        if (text.Length == 0)
        {
            return BadRequest("q: give the query text, e.g. /api/search?q=valve+inspection&k=10");
        }

        var k = 10;
        if (kValues.Count == 1 && !int.TryParse(kValues[0], NumberStyles.None, CultureInfo.InvariantCulture, out k))
        {
            return BadRequest(string.Create(CultureInfo.InvariantCulture, $"k: give a whole number from 1 to {caps.MaxResults} (Query:MaxResults)."));
        }

        if (QueryCaps.Problem(text, k, caps) is { } problem)
        {
            return BadRequest(problem);
        }

        foreach (var single in new[] { "modified-since", "min-score", "offset" })
        {
            if (query[single].Count > 1)
            {
                return BadRequest(string.Create(CultureInfo.InvariantCulture, $"{single}: give it once; it came {query[single].Count} times."));
            }
        }

        var (filter, filterProblem) = SearchFilter.Parse(
            [.. query["root"].OfType<string>()], [.. query["folder"].OfType<string>()], [.. query["type"].OfType<string>()],
            query["modified-since"].FirstOrDefault(), query["min-score"].FirstOrDefault(), query["offset"].FirstOrDefault());
        if ((filterProblem ?? unknownRoot(filter!)) is { } badFilter)
        {
            return BadRequest(badFilter);
        }

        SearchReport report;
        try
        {
            report = search(text, k, filter!, cancellationToken);
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            // The caller still gets the 500 with its reason (DaemonApi); health reports it from now on.
            state.SearchFailed(ex.Message);
            throw;
        }

        state.SearchSucceeded();
        return Results.Json(report, ApiJson.Options);
    }

    private static IResult BadRequest(string error) => Results.Json(new { error }, ApiJson.Options, statusCode: StatusCodes.Status400BadRequest);
}
