using IndexKeeper.Core.Encoding;
using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>The encoders that wrote vector sets in this index, their settings, retirement, and the serving one.</summary>
public sealed class EncoderTable
{
    private readonly ILiteCollection<EncoderRecord> encoders;
    private readonly ILiteCollection<BsonDocument> meta;

    internal EncoderTable(CatalogStore store)
    {
        encoders = store.Encoders;
        meta = store.Meta;
    }

    public EncoderRecord? Find(string encoderId) => encoders.FindById(encoderId);

    public IReadOnlyList<EncoderRecord> All() => encoders.FindAll().ToList();

    public void Put(EncoderRecord record) => encoders.Upsert(record);

    /// <summary>The encoder searches rank with (meta <c>servingEncoder</c>); null until first recorded.</summary>
    public string? ServingId() => meta.FindById(CatalogSchema.ServingEncoderMetaId) is { } doc ? doc["encoderId"].AsString : null;

    /// <summary>Records an encoder the first time it writes a vector set.</summary>
    public void Register(EncoderIdentity identity)
    {
        ArgumentNullException.ThrowIfNull(identity);
        if (encoders.FindById(identity.Id) is null)
        {
            encoders.Insert(NewRecord(identity));
        }
    }

    /// <summary>
    /// Records the configured encoder with the settings that build it again; an encoder configured again
    /// after retirement is in use once more (its dead vectors are not revived: they are embedded afresh).
    /// </summary>
    public void Register(EncoderIdentity identity, IReadOnlyDictionary<string, string> settings)
    {
        ArgumentNullException.ThrowIfNull(identity);
        ArgumentNullException.ThrowIfNull(settings);
        var record = encoders.FindById(identity.Id) ?? NewRecord(identity);
        record.Settings = new Dictionary<string, string>(settings, StringComparer.Ordinal);
        record.Retired = false;
        record.RetiredUtc = null;
        encoders.Upsert(record);
    }

    internal HashSet<string> RetiredIds() =>
        encoders.Query().Where(e => e.Retired).Select(e => e.Id).ToEnumerable().ToHashSet(StringComparer.Ordinal);

    private static EncoderRecord NewRecord(EncoderIdentity identity) => new()
    {
        Id = identity.Id,
        Name = identity.Name,
        Description = identity.Description,
        Dimensions = identity.Dimensions,
        FirstUsedUtc = DateTime.UtcNow,
    };
}
