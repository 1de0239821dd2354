using System.Globalization;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Service.Querying;

/// <summary>Checks a query against <see cref="QueryOptions"/> before anything is encoded. Pure.</summary>
public static class QueryCaps
{
    /// <summary>Why the query may not run, naming the cap it passes; null when it may.</summary>
    public static string? Problem(string text, int k, QueryOptions caps)
    {
        ArgumentNullException.ThrowIfNull(text);
        ArgumentNullException.ThrowIfNull(caps);
        var c = CultureInfo.InvariantCulture;
        if (k < 1 || k > caps.MaxResults)
        {
            return string.Create(c, $"k {k}: give a whole number from 1 to {caps.MaxResults} (Query:MaxResults).");
        }

        if (text.Length > caps.MaxCharacters)
        {
            return string.Create(c, $"the query has {text.Length} characters; Query:MaxCharacters allows {caps.MaxCharacters}.");
        }

        // Terms as the encoders split them: runs between white space.
        var terms = text.Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries).Length;
        return terms > caps.MaxTerms ? string.Create(c, $"the query has {terms} terms; Query:MaxTerms allows {caps.MaxTerms}.") : null;
    }
}
