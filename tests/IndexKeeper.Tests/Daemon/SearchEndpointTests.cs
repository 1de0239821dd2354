using IndexKeeper.Core.Health;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Daemon;
using IndexKeeper.Service.Querying;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Primitives;

namespace IndexKeeper.Tests.Daemon;

/// <summary>
/// /api/search with an injected search: a failing search makes health unhealthy with its reason until a
/// search succeeds again; refused parameters never reach the search.
/// </summary>
public sealed class SearchEndpointTests
{
    private static readonly HealthLimits Limits = new(TimeSpan.FromHours(1), 0.5, 0.1, TimeSpan.FromMinutes(15));
    private static readonly QueryOptions Caps = new();

    [Fact]
    public void AFailingSearchTurnsHealthUnhealthyWithItsReasonUntilOneSucceeds()
    {
        var state = new DaemonState(TimeProvider.System, 16);
        Assert.Equal(HealthStatus.Healthy, HealthRules.Evaluate(state.HealthSnapshot(), Limits).Status);

        var failure = Assert.Throws<IOException>(() => SearchEndpoint.Answer(
            Query(("q", "weir gate")), Caps, NoUnknownRoot, (_, _, _, _) => throw new IOException("segment 000012.seg: record checksum mismatch"), state, CancellationToken.None));
        var health = HealthRules.Evaluate(state.HealthSnapshot(), Limits);
        Assert.Equal(HealthStatus.Unhealthy, health.Status);
        var reason = Assert.Single(health.Reasons);
        Assert.Equal("search-failing", reason.Code);
        Assert.Contains(failure.Message, reason.Message, StringComparison.Ordinal);

        var answer = SearchEndpoint.Answer(Query(("q", "weir gate"), ("k", "3")), Caps, NoUnknownRoot, (q, k, _, _) => new SearchReport { Query = q }, state, CancellationToken.None);
        Assert.IsType<JsonHttpResult<SearchReport>>(answer);
        Assert.Equal(HealthStatus.Degraded, HealthRules.Evaluate(state.HealthSnapshot(), Limits).Status);
    }

    [Fact]
    public void ACancelledSearchIsNotAFailure()
    {
        var state = new DaemonState(TimeProvider.System, 16);
        Assert.Throws<OperationCanceledException>(() => SearchEndpoint.Answer(
            Query(("q", "weir")), Caps, NoUnknownRoot, (_, _, _, _) => throw new OperationCanceledException(), state, CancellationToken.None));
        Assert.Equal(HealthStatus.Healthy, HealthRules.Evaluate(state.HealthSnapshot(), Limits).Status);
    }

    [Theory]
    [InlineData("q", "weir", "q", "gate")]
    [InlineData("q", "weir", "k", "x")]
    [InlineData("q", "weir", "k", "0")]
    [InlineData("q", "weir", "k", "101")]
    [InlineData("q", "  ", "k", "5")]
    [InlineData("k", "5", "k", "6")]
    public void RefusedParametersAre400AndNeverSearched(string name1, string value1, string name2, string value2)
    {
        var state = new DaemonState(TimeProvider.System, 16);
        var answer = SearchEndpoint.Answer(
            Query((name1, value1), (name2, value2)), Caps, NoUnknownRoot, (_, _, _, _) => throw new InvalidOperationException("must not be called"), state, CancellationToken.None);
        Assert.Equal(StatusCodes.Status400BadRequest, Assert.IsAssignableFrom<IStatusCodeHttpResult>(answer).StatusCode);
        Assert.Equal(HealthStatus.Healthy, HealthRules.Evaluate(state.HealthSnapshot(), Limits).Status);
    }

    [Theory]
    [InlineData("root", "elsewhere", "root 'elsewhere'")]
    [InlineData("modified-since", "2026-13-45", "modified-since '2026-13-45'")]
    [InlineData("modified-since", "30/11/2026", "modified-since '30/11/2026'")]
    [InlineData("type", "spreadsheet", "type 'spreadsheet'")]
    [InlineData("min-score", "high", "min-score 'high'")]
    [InlineData("offset", "-1", "offset '-1'")]
    [InlineData("offset", "10001", "offset '10001'")]
    [InlineData("folder", "../outside", "folder '../outside'")]
    public void A_bad_filter_is_400_naming_it_and_never_searched(string name, string value, string named)
    {
        var state = new DaemonState(TimeProvider.System, 16);
        var answer = SearchEndpoint.Answer(
            Query(("q", "weir"), (name, value)), Caps, f => f.Roots.Contains("elsewhere") ? "root 'elsewhere' is not a root of this index" : null,
            (_, _, _, _) => throw new InvalidOperationException("must not be called"), state, CancellationToken.None);
        Assert.Equal(StatusCodes.Status400BadRequest, Assert.IsAssignableFrom<IStatusCodeHttpResult>(answer).StatusCode);
        var body = System.Text.Json.JsonSerializer.Serialize(
            Assert.IsAssignableFrom<IValueHttpResult>(answer).Value, new System.Text.Json.JsonSerializerOptions { Encoder = System.Text.Encodings.Web.JavaScriptEncoder.UnsafeRelaxedJsonEscaping });
        Assert.Contains(named, body, StringComparison.Ordinal);
    }

    [Fact]
    public void Filters_reach_the_search_as_given()
    {
        SearchFilter? seen = null;
        SearchEndpoint.Answer(
            Query(("q", "weir"), ("root", "plant"), ("folder", "reports/**"), ("type", "pdf"), ("modified-since", "2026-11-30"), ("min-score", "1.5"), ("offset", "20")),
            Caps, NoUnknownRoot, (q, _, f, _) => { seen = f; return new SearchReport { Query = q }; }, new DaemonState(TimeProvider.System, 16), CancellationToken.None);
        Assert.NotNull(seen);
        Assert.Equal(["plant"], seen.Roots);
        Assert.Equal(["reports/**"], seen.Folders);
        Assert.Equal([Core.Documents.DocumentKind.Pdf], seen.Types);
        Assert.Equal(new DateTime(2026, 11, 30, 0, 0, 0, DateTimeKind.Utc), seen.ModifiedSinceUtc);
        Assert.Equal(1.5, seen.MinimumScore);
        Assert.Equal(20, seen.Offset);
    }

    private static string? NoUnknownRoot(SearchFilter filter) => null;

    private static QueryCollection Query(params (string Name, string Value)[] pairs) =>
        new(pairs.GroupBy(p => p.Name).ToDictionary(g => g.Key, g => new StringValues(g.Select(p => p.Value).ToArray())));
}
