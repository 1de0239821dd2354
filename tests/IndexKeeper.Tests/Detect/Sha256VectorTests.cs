using IndexKeeper.Core.Detect;

namespace IndexKeeper.Tests.Detect;

public sealed class Sha256VectorTests
{
    // Digests from FIPS 180-4 with the NIST CSRC "Examples with Intermediate Values" (SHA-256: "abc",
    // the 448-bit two-block message) and FIPS 180-2 Appendix B.3 (one million 'a').
    public static TheoryData<string, int, string, int> Vectors => new()
    {
        { "abc", 1, "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", 1 },
        { "abc", 1, "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", FileHasher.DefaultBufferSize },
        { "abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq", 1, "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1", 7 },
        { "a", 1_000_000, "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0", 1000 },
        { "a", 1_000_000, "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0", FileHasher.DefaultBufferSize },
        // SHA-256 of the empty message (well known; also `sha256sum /dev/null` from coreutils).
        { string.Empty, 0, "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855", 64 },
    };

    [Theory]
    [MemberData(nameof(Vectors))]
    public void Streams_published_vectors_through_a_file(string unit, int repeat, string expectedHex, int bufferSize)
    {
        using var tree = new TempTree();
        var path = tree.Write("vector.bin", System.Text.Encoding.ASCII.GetBytes(string.Concat(Enumerable.Repeat(unit, repeat))));

        var result = FileHasher.Create(bufferSize).Hash(path, CancellationToken.None);

        Assert.Equal(FileHashStatus.Stable, result.Status);
        Assert.Equal(expectedHex, Convert.ToHexStringLower(result.Sha256!));
        Assert.Equal(result.Before, result.After);
    }
}
