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
            Query(("q", "weir gate")), Caps, (_, _, _) => throw new IOException("segment 000012.seg: record checksum mismatch"), state, CancellationToken.None));
        var health = HealthRules.Evaluate(state.HealthSnapshot(), Limits);
        Assert.Equal(HealthStatus.Unhealthy, health.Status);
        var reason = Assert.Single(health.Reasons);
        Assert.Equal("search-failing", reason.Code);
        Assert.Contains(failure.Message, reason.Message, StringComparison.Ordinal);

        var answer = SearchEndpoint.Answer(Query(("q", "weir gate"), ("k", "3")), Caps, (q, k, _) => new SearchReport { Query = q }, state, CancellationToken.None);
        Assert.IsType<JsonHttpResult<SearchReport>>(answer);
        Assert.Equal(HealthStatus.Degraded, HealthRules.Evaluate(state.HealthSnapshot(), Limits).Status);
    }

    [Fact]
    public void ACancelledSearchIsNotAFailure()
    {
        var state = new DaemonState(TimeProvider.System, 16);
        Assert.Throws<OperationCanceledException>(() => SearchEndpoint.Answer(
            Query(("q", "weir")), Caps, (_, _, _) => throw new OperationCanceledException(), state, CancellationToken.None));
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
            Query((name1, value1), (name2, value2)), Caps, (_, _, _) => throw new InvalidOperationException("must not be called"), state, CancellationToken.None);
        Assert.Equal(StatusCodes.Status400BadRequest, Assert.IsAssignableFrom<IStatusCodeHttpResult>(answer).StatusCode);
        Assert.Equal(HealthStatus.Healthy, HealthRules.Evaluate(state.HealthSnapshot(), Limits).Status);
    }

    private static QueryCollection Query(params (string Name, string Value)[] pairs) =>
        new(pairs.GroupBy(p => p.Name).ToDictionary(g => g.Key, g => new StringValues(g.Select(p => p.Value).ToArray())));
}
