using IndexKeeper.Core.Documents;

namespace IndexKeeper.Tests.Documents;

public sealed class PageKeyTests
{
    [Fact]
    public void Of_hashes_with_sha256()
    {
        // FIPS 180-4 / NIST CSRC example: SHA-256("abc").
        var key = PageKey.Of("abc"u8);
        Assert.Equal("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", key.Hex);
    }

    [Fact]
    public void Parse_rejects_non_hex()
    {
        Assert.Throws<FormatException>(() => PageKey.Parse("xyz"));
        Assert.Equal(PageKey.Of("abc"u8), PageKey.Parse("BA7816BF8F01CFEA414140DE5DAE2223B00361A396177A9CB410FF61F20015AD"));
    }
}
