using System.Globalization;
using System.Security.Cryptography;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;

namespace IndexKeeper.Tests.Encoding;

public sealed class HashedTermEncoderTests
{
    private static readonly PageKey Key = PageKey.Of("harrowmere pump station 4, inspection form"u8);

    [Theory]
    // Published FNV-1a 64-bit test vectors (FNV reference, draft-eastlake-fnv, test suite).
    [InlineData("", 0xcbf29ce484222325UL)]
    [InlineData("a", 0xaf63dc4c8601ec8cUL)]
    [InlineData("foobar", 0x85944171f73967e8UL)]
    public void Fnv1a64_matches_the_published_test_vectors(string text, ulong expected) =>
        Assert.Equal(expected, Fnv1a64.Hash(System.Text.Encoding.ASCII.GetBytes(text)));

    [Fact]
    public void Fnv1a64_append_continues_the_hash() =>
        Assert.Equal(Fnv1a64.Hash("foobar"u8), Fnv1a64.Append(Fnv1a64.Hash("foo"u8), "bar"u8));

    [Theory]
    // Golden vectors, computed once by scheme 1 and checked in as a regression guard: the same words must
    // give these exact floats in any process, on any platform, after any restart.
    [InlineData("reservoir", 0, "2:-0.25 6:-0.25 8:-0.25 17:-0.25 23:0.25 26:0.25 36:-0.25 61:-0.25 69:0.25 79:-0.25 85:-0.25 86:-0.25 96:-0.25 107:-0.25 119:-0.25 124:0.25")]
    [InlineData("Harrowmere", 0, "12:0.25 14:0.25 36:-0.25 44:-0.25 46:-0.25 51:0.25 57:0.25 62:0.25 68:0.25 72:-0.5 77:0.25 80:0.25 86:-0.25")]
    [InlineData("chlorination", 0, "10:-0.25 20:-0.25 26:0.25 31:-0.25 33:-0.25 34:0.25 61:-0.25 72:0.25 79:0.25 106:0.25 112:0.25 113:0.25 115:-0.25 119:0.25 121:-0.25 124:-0.25")]
    [InlineData("valve", 3, "0:-0.21320072 4:-0.21320072 5:-0.10660036 9:-0.21320072 11:-0.10660036 12:0.10660036 13:0.10660036 14:0.10660036 18:0.10660036 19:0.10660036 21:0.10660036 23:0.10660036 25:-0.10660036 26:-0.10660036 30:-0.10660036 31:0.10660036 32:0.10660036 33:0.10660036 34:0.10660036 35:-0.10660036 37:0.21320072 40:-0.10660036 41:0.10660036 42:0.10660036 44:-0.21320072 50:-0.10660036 53:-0.10660036 57:-0.10660036 59:0.10660036 60:-0.10660036 62:0.10660036 64:-0.10660036 66:0.10660036 69:0.10660036 70:-0.10660036 71:0.10660036 73:0.10660036 76:0.10660036 80:0.21320072 84:0.10660036 85:0.10660036 88:0.10660036 89:-0.10660036 91:0.10660036 92:0.10660036 94:-0.10660036 95:0.10660036 97:-0.10660036 101:0.10660036 105:0.10660036 106:-0.10660036 107:-0.10660036 111:0.31980106 112:0.10660036 114:-0.21320072 116:0.10660036 118:0.10660036 119:-0.10660036 124:-0.10660036")]
    public void Vectors_match_the_checked_in_golden_vectors(string word, int nGram, string golden)
    {
        var encoder = HashedTermEncoderFactory.Create(new HashedTermEncoderOptions { CharacterNGramLength = nGram });
        var vector = encoder.EncodeQuery(word, CancellationToken.None).Row(0).ToArray();
        Assert.Equal(golden, Describe(vector));
    }

    [Theory]
    [InlineData("pre-filter", "filter")]
    [InlineData("pre-filter", "pre-filter")]
    [InlineData("pre-filter", "prefilter")]
    [InlineData("A-113", "113")]
    [InlineData("A-113", "A113")]
    [InlineData("A-113", "a-113")]
    [InlineData("KESTREL53", "kestrel53")]
    public void A_word_is_found_by_its_uax29_parts_and_whole(string onPage, string query)
    {
        // UAX #29 (WordBreakTest.txt-checked boundaries): a hyphen splits, letters and digits join.
        var encoder = HashedTermEncoderFactory.Create(new HashedTermEncoderOptions());
        var page = encoder.EncodePages([new PageToEncode(PageKey.Of("p"u8), "", 1, 612, 792, [new PageWord(onPage, new PageBox(0, 0, 10, 10))])], CancellationToken.None)[0];
        var terms = encoder.EncodeQuery(query, CancellationToken.None);
        for (var q = 0; q < terms.Count; q++)
        {
            var best = Enumerable.Range(0, page.Count).Max(r => Dot(terms.Row(q), page.Row(r)));
            Assert.True(best > 0.999f, $"query term {q} of '{query}' meets '{onPage}' at {best}");
        }
    }

    [Fact]
    public void A_part_alone_does_not_match_another_word_nor_the_whole_of_a_different_one()
    {
        var encoder = HashedTermEncoderFactory.Create(new HashedTermEncoderOptions());
        var page = encoder.EncodePages([new PageToEncode(PageKey.Of("p"u8), "", 1, 612, 792, [new PageWord("A-113", new PageBox(0, 0, 10, 10))])], CancellationToken.None)[0];
        Assert.Equal(3, page.Count); // a, 113, a113
        var other = encoder.EncodeQuery("B114", CancellationToken.None);
        Assert.True(Enumerable.Range(0, page.Count).Max(r => Dot(other.Row(0), page.Row(r))) < 0.5f);
    }

    private static float Dot(ReadOnlySpan<float> a, ReadOnlySpan<float> b)
    {
        var sum = 0f;
        for (var i = 0; i < a.Length; i++)
        {
            sum += a[i] * b[i];
        }

        return sum;
    }

    [Fact]
    public void Identity_is_the_sha256_of_a_description_naming_every_setting()
    {
        var identity = HashedTermEncoderFactory.Create(new HashedTermEncoderOptions()).Identity;
        Assert.Equal("hashed-terms", identity.Name);
        Assert.Equal(128, identity.Dimensions);
        Assert.Equal(
            "hashed-terms;scheme=2;hash=fnv1a64;unicode=15.0.0;normalise=nfkc+casefold+letters-marks-digits;terms=uax29-words+whole;dimensions=128;probes=16;ngram=0;seed=0;pool=1;pooling=ward-lance-williams-renormalised-mean-v1;stored=float16-binary16-nearest-even+sign-bits-64-per-word-lsb-first",
            identity.Description);

        // FIPS 180-4 SHA-256 through the platform's implementation, an independent library.
        Assert.Equal(Convert.ToHexStringLower(SHA256.HashData(System.Text.Encoding.UTF8.GetBytes(identity.Description))), identity.Id);

        // The same digest from coreutils' sha256sum over the description, checked in as a regression guard.
        Assert.Equal("d31d531eebc648a78bf5f33094b1d0d309c4195766bc01c949d484a107bc9c78", identity.Id);
    }

    [Fact]
    public void Every_setting_changes_the_encoder_id()
    {
        HashedTermEncoderOptions[] variants =
        [
            new(),
            new() { Dimensions = 256 },
            new() { Probes = 8 },
            new() { CharacterNGramLength = 3 },
            new() { Seed = 7 },
            new() { PoolFactor = 2 },
        ];
        var ids = variants.Select(o => HashedTermEncoderFactory.Create(o).Identity.Id).ToList();
        Assert.Equal(ids.Count, ids.Distinct().Count());
        Assert.Equal(ids[0], HashedTermEncoderFactory.Create(new HashedTermEncoderOptions()).Identity.Id);
    }

    [Fact]
    public void Identical_terms_give_identical_vectors_with_their_own_boxes()
    {
        var encoder = HashedTermEncoderFactory.Create(new HashedTermEncoderOptions());
        var page = Page(("Valve", 10), ("chamber", 60), ("valve,", 120), ("VALVE", 180));
        var set = encoder.EncodePages([page], CancellationToken.None)[0];

        Assert.Equal(4, set.Count);
        Assert.Equal(set.Row(0).ToArray(), set.Row(2).ToArray());
        Assert.Equal(set.Row(0).ToArray(), set.Row(3).ToArray());
        Assert.NotEqual(set.Row(0).ToArray(), set.Row(1).ToArray());
        Assert.Equal(page.Words.Select(w => w.Box), set.Regions);

        var query = encoder.EncodeQuery("valve", CancellationToken.None);
        Assert.Equal(set.Row(0).ToArray(), query.Row(0).ToArray());
        Assert.Equal(default, query.Regions[0]);
    }

    [Fact]
    public void A_query_has_one_vector_per_term_and_punctuation_gives_none()
    {
        var encoder = HashedTermEncoderFactory.Create(new HashedTermEncoderOptions());
        // pressure, drop, at, then pump, station and pumpstation (UAX #29 parts and the whole, scheme 2).
        Assert.Equal(6, encoder.EncodeQuery("  pressure — drop at\tpump-station ", CancellationToken.None).Count);
        Assert.Equal(0, encoder.EncodeQuery("— ; !", CancellationToken.None).Count);
        Assert.Equal(1, encoder.EncodePages([Page(("§", 0), ("meter", 50))], CancellationToken.None)[0].Count);
    }

    [Theory]
    [InlineData(0, 1)]
    [InlineData(3, 1)]
    [InlineData(0, 3)]
    [InlineData(4, 2)]
    public void Every_row_has_unit_length(int nGram, int poolFactor)
    {
        var encoder = HashedTermEncoderFactory.Create(new HashedTermEncoderOptions { CharacterNGramLength = nGram, PoolFactor = poolFactor, Probes = 2 });
        var words = Enumerable.Range(0, 400).Select(i => ($"w{i * 7919 % 1000}x{i % 13}", (float)i)).ToArray();
        var set = encoder.EncodePages([Page(words)], CancellationToken.None)[0];
        for (var i = 0; i < set.Count; i++)
        {
            var row = set.Row(i);
            var norm = Math.Sqrt(row.ToArray().Sum(x => (double)x * x));
            Assert.InRange(norm, 1 - 1e-6, 1 + 1e-6);
        }
    }

    [Fact]
    public void Pooling_in_the_encoder_divides_the_vector_count()
    {
        var words = Enumerable.Range(0, 101).Select(i => ($"term{i}", (float)i)).ToArray();
        var plain = HashedTermEncoderFactory.Create(new HashedTermEncoderOptions()).EncodePages([Page(words)], CancellationToken.None)[0];
        var pooled = HashedTermEncoderFactory.Create(new HashedTermEncoderOptions { PoolFactor = 4 }).EncodePages([Page(words)], CancellationToken.None)[0];
        Assert.Equal(101, plain.Count);
        Assert.Equal(26, pooled.Count);
    }

    [Fact]
    public void Bad_options_are_all_reported_by_name()
    {
        var options = new HashedTermEncoderOptions { Dimensions = 100, Probes = 0, CharacterNGramLength = 1, PoolFactor = 0 };
        var error = Assert.Throws<ArgumentException>(() => HashedTermEncoderFactory.Create(options));
        foreach (var name in new[] { "Dimensions", "Probes", "CharacterNGramLength", "PoolFactor" })
        {
            Assert.Contains(name, error.Message, StringComparison.Ordinal);
        }

        Assert.Empty(new HashedTermEncoderOptions().Validate());
    }

    [Fact]
    public void Encoding_stops_when_cancelled()
    {
        var encoder = HashedTermEncoderFactory.Create(new HashedTermEncoderOptions());
        using var cancelled = new CancellationTokenSource();
        cancelled.Cancel();
        Assert.ThrowsAny<OperationCanceledException>(() => encoder.EncodePages([Page(("meter", 0))], cancelled.Token));
        Assert.ThrowsAny<OperationCanceledException>(() => encoder.EncodeQuery("meter", cancelled.Token));
    }

    private static PageToEncode Page(params (string Text, float X)[] words) =>
        new(Key, "/data/harrowmere/forms/inspection-4.pdf", 1, 595, 842, words.Select(w => new PageWord(w.Text, new PageBox(w.X, 700, w.X + 40, 712))).ToList());

    private static string Describe(float[] vector) =>
        string.Join(' ', vector.Select((v, i) => (v, i)).Where(e => e.v != 0).Select(e => string.Create(CultureInfo.InvariantCulture, $"{e.i}:{e.v:R}")));
}
