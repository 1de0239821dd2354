using IndexKeeper.Core.Catalog;
using LiteDB;

namespace IndexKeeper.Tests.Catalog;

public sealed class ByKeysTests
{
    [Fact]
    public void Many_keys_find_what_one_lookup_each_finds_across_query_chunks()
    {
        using var database = new LiteDatabase(new MemoryStream());
        var pages = database.GetCollection("pages");
        pages.InsertBulk(Enumerable.Range(0, 1200).Select(i => new BsonDocument { ["_id"] = $"k{i:x4}", ["References"] = i % 3 }));

        // More keys than one query takes, some asked twice, some without a record.
        var asked = Enumerable.Range(0, 1300).Select(i => $"k{i:x4}").Concat(["k0001", "k0002"]).ToList();
        var found = ByKeys.Find(pages, asked, d => d["_id"].AsString);

        // The reference: LiteDB's own lookup by key, one key at a time.
        var expected = asked.Distinct().Select(k => pages.FindById(k)).OfType<BsonDocument>().ToDictionary(d => d["_id"].AsString);
        Assert.Equal(1200, found.Count);
        Assert.Equal(expected.Keys.Order(StringComparer.Ordinal), found.Keys.Order(StringComparer.Ordinal));
        Assert.All(expected, e => Assert.Equal(e.Value["References"].AsInt32, found[e.Key]["References"].AsInt32));
        Assert.Empty(ByKeys.Find(pages, [], d => d["_id"].AsString));
    }

    [Fact]
    public void Deleting_many_keys_deletes_those_records_only()
    {
        using var database = new LiteDatabase(new MemoryStream());
        var queue = database.GetCollection("queue");
        queue.InsertBulk(Enumerable.Range(0, 1200).Select(i => new BsonDocument { ["_id"] = $"k{i:x4}" }));

        var gone = Enumerable.Range(0, 1300).Where(i => i % 2 == 0).Select(i => $"k{i:x4}").ToList();
        Assert.Equal(600, ByKeys.Delete(queue, [.. gone, "k0000"]));

        // The reference: LiteDB's own count and lookups.
        Assert.Equal(600, queue.Count());
        Assert.All(Enumerable.Range(0, 1200), i => Assert.Equal(i % 2 == 1, queue.FindById($"k{i:x4}") is not null));
    }
}
