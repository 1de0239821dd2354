using System.Security.Cryptography;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;

namespace IndexKeeper.Tests.Storage;

/// <summary>Seeded random vector sets for storage tests (invented data, no meaning beyond the bytes).</summary>
internal static class TestVectors
{
    public const string EncoderId = "0f1e2d3c4b5a69788796a5b4c3d2e1f00f1e2d3c4b5a69788796a5b4c3d2e1f0";

    public static PageKey Key(int n) => PageKey.FromHash(SHA256.HashData(BitConverter.GetBytes(n)));

    public static VectorSet Set(int seed, int count, int dimensions = 64)
    {
        var random = new Random(seed);
        var vectors = new float[count * dimensions];
        for (var i = 0; i < vectors.Length; i++)
        {
            vectors[i] = (float)((random.NextDouble() * 2) - 1);
        }

        var regions = new PageBox[count];
        for (var i = 0; i < count; i++)
        {
            var left = random.Next(0, 500);
            var bottom = random.Next(0, 700);
            regions[i] = new PageBox(left, bottom, left + random.Next(1, 90), bottom + random.Next(1, 30));
        }

        return new VectorSet(dimensions, vectors, regions);
    }
}
