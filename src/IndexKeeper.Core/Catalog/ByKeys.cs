using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>
/// Many records of one collection by their keys in a few queries (<c>_id IN [...]</c>) instead of one lookup each: a
/// LiteDB lookup pays a snapshot, a query pipeline and a reader per call, which for the coordinator's few reads of each
/// committed page was most of its catalog time (docs/benchmarks.md, workqueue run 12).
/// </summary>
internal static class ByKeys
{
    // Keys per query: bounds the size of one query's parameter.
    private const int Chunk = 512;

    // The keys go in as a parameter: LiteDB compiles each distinct expression text once and keeps it (Query.In writes the
    // keys into the text, so every call compiled a new expression and added it to LiteDB's cache for good).
    private const string KeyIn = "_id IN @0";

    /// <summary>The records found, keyed by <paramref name="keyOf"/>; a key without a record is absent.</summary>
    public static Dictionary<string, T> Find<T>(ILiteCollection<T> collection, IEnumerable<string> keys, Func<T, string> keyOf)
    {
        var found = new Dictionary<string, T>(StringComparer.Ordinal);
        foreach (var record in Queries(keys).SelectMany(query => collection.Find(query)))
        {
            found[keyOf(record)] = record;
        }

        return found;
    }

    /// <summary>Deletes the records of these keys (a key without a record is passed over); returns how many were deleted.</summary>
    public static int Delete<T>(ILiteCollection<T> collection, IEnumerable<string> keys) => Queries(keys).Sum(query => collection.DeleteMany(query));

    /// <summary>One <c>_id IN @0</c> predicate for each chunk of the distinct keys.</summary>
    private static IEnumerable<BsonExpression> Queries(IEnumerable<string> keys) =>
        keys.Distinct(StringComparer.Ordinal).Chunk(Chunk).Select(chunk => BsonExpression.Create(KeyIn, new BsonArray(chunk.Select(k => new BsonValue(k)))));
}
