using System.Runtime.InteropServices;
using System.Security.Cryptography;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Index;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>The live vector sets of an index as stored: page key → SHA-256 of the stored vectors and regions.</summary>
internal static class IndexVectors
{
    public static Dictionary<string, string> Read(string indexDirectory)
    {
        using var gate = ReaderGate.EnterShared(indexDirectory);
        using var catalog = IndexCatalog.OpenReadOnly(gate);
        using var store = VectorStore.OpenForReading(catalog, indexDirectory);
        var encoderId = catalog.Encoders.ServingId() ?? catalog.Encoders.All().Single().Id;
        using var live = store.OpenLive(encoderId);
        var read = new Dictionary<string, string>(StringComparer.Ordinal);
        for (var i = 0; i < live.Source.Count; i++)
        {
            var stored = live.Source.Get(i);
            using var sha = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
            sha.AppendData(MemoryMarshal.AsBytes(stored.Vectors));
            sha.AppendData(MemoryMarshal.AsBytes(stored.Regions));
            read.Add(stored.Key.Hex, Convert.ToHexStringLower(sha.GetHashAndReset()));
        }

        return read;
    }
}
