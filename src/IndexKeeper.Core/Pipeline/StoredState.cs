using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;

namespace IndexKeeper.Core.Pipeline;

/// <summary>Moves the quick-check state between a catalog document and the Detect stage's records.</summary>
internal static class StoredState
{
    public static StoredFileState Of(DocumentRecord record) => new(
        new FileStat(record.Size, record.ModifiedTicksUtc, new FileIdentity(unchecked((ulong)record.Device), unchecked((ulong)record.FileIndex))),
        record.FileHash.Length == 64 ? Convert.FromHexString(record.FileHash) : null,
        record.CheckedAtTicksUtc);

    /// <summary>Stamps the stat the hash was taken with, and when, so the next quick check can trust it.</summary>
    public static void Stamp(DocumentRecord record, FileHashResult hash)
    {
        record.Size = hash.After.Size;
        record.ModifiedTicksUtc = hash.After.ModifiedTicksUtc;
        record.Device = unchecked((long)hash.After.Identity.Device);
        record.FileIndex = unchecked((long)hash.After.Identity.Index);
        record.CheckedAtTicksUtc = hash.CheckedAtTicksUtc;
        record.FileHash = Convert.ToHexStringLower(hash.Sha256!);
    }
}
