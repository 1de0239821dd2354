using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Querying;

namespace IndexKeeper.Tests.Search;

/// <summary>The query caps as a pure function: each cap at, below and above its limit, each refusal naming its setting.</summary>
public sealed class QueryCapsRuleTests
{
    private static readonly QueryOptions Caps = new() { MaxCharacters = 24, MaxTerms = 3, MaxResults = 5 };

    [Theory]
    [InlineData("weir", 1, null)]
    [InlineData("weir", 5, null)]
    [InlineData("weir", 0, "Query:MaxResults")]
    [InlineData("weir", 6, "Query:MaxResults")]
    [InlineData("weir", -1, "Query:MaxResults")]
    [InlineData("weir gate sluice", 5, null)]
    [InlineData("weir gate sluice culvert", 5, "Query:MaxTerms")]
    [InlineData("  weir \t gate\n sluice  ", 5, null)] // white space of any kind and length separates terms
    [InlineData("weirgatesluiceculvertloc", 5, null)] // 24 characters
    [InlineData("weirgatesluiceculvertlock", 5, "Query:MaxCharacters")]
    public void EachCapRefusesJustPastItsLimit(string text, int k, string? setting)
    {
        var problem = QueryCaps.Problem(text, k, Caps);
        if (setting is null)
        {
            Assert.Null(problem);
        }
        else
        {
            Assert.NotNull(problem);
            Assert.Contains(setting, problem, StringComparison.Ordinal);
        }
    }
}
