using System.Buffers.Binary;
using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Encoding;

/// <summary>
/// Hashed-term scheme 1 (docs/encoders.md): each normalised term and, optionally, each of its character
/// n-grams is a feature; a feature adds ±1 to <c>probes</c> buckets chosen by FNV-1a 64 of
/// (seed, probe, feature kind, UTF-8 bytes); the sum is L2-normalised. Integer sums and one correctly rounded
/// square root make the floats identical on every platform.
/// </summary>
internal sealed class HashedTermEncoder : IPageEncoder
{
    private const byte TermFeature = 1; // never change: part of hashed-term scheme 1
    private const byte NGramFeature = 2; // never change: part of hashed-term scheme 1
    private const string WordStart = "<";
    private const string WordEnd = ">";

    private readonly int dimensions;
    private readonly int probes;
    private readonly int nGramLength;
    private readonly ulong seed;
    private readonly int poolFactor;

    public HashedTermEncoder(EncoderIdentity identity, int dimensions, int probes, int nGramLength, ulong seed, int poolFactor)
    {
        Identity = identity;
        this.dimensions = dimensions;
        this.probes = probes;
        this.nGramLength = nGramLength;
        this.seed = seed;
        this.poolFactor = poolFactor;
    }

    public EncoderIdentity Identity { get; }

    public IReadOnlyList<VectorSet> EncodePages(IReadOnlyList<PageToEncode> pages, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pages);
        var cache = new Dictionary<string, float[]?>(StringComparer.Ordinal);
        var result = new VectorSet[pages.Count];
        for (var p = 0; p < pages.Count; p++)
        {
            cancellationToken.ThrowIfCancellationRequested();
            var words = pages[p].Words;
            var vectors = new List<float[]>(words.Count);
            var regions = new List<PageBox>(words.Count);
            foreach (var word in words)
            {
                foreach (var term in Terms(word.Text))
                {
                    if (TermVector(term, cache) is { } vector)
                    {
                        vectors.Add(vector);
                        regions.Add(word.Box);
                    }
                }
            }

            var set = new VectorSet(dimensions, Flatten(vectors), regions.ToArray());
            result[p] = poolFactor > 1 ? VectorPooling.Pool(set, poolFactor) : set;
        }

        return result;
    }

    public VectorSet EncodeQuery(string text, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(text);
        cancellationToken.ThrowIfCancellationRequested();
        var cache = new Dictionary<string, float[]?>(StringComparer.Ordinal);
        var vectors = text.Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries)
            .SelectMany(Terms)
            .Select(term => TermVector(term, cache))
            .OfType<float[]>()
            .ToList();
        return new VectorSet(dimensions, Flatten(vectors), new PageBox[vectors.Count]);
    }

    /// <summary>
    /// The terms of one white-space word (scheme 2): each UAX #29 word in it that keeps a letter, mark or digit,
    /// then the whole word when it holds more than one, so that "pre-filter" and "A-113" are found by their parts
    /// and as written, and "KESTREL53" (one UAX #29 word) stays one term.
    /// </summary>
    internal static IEnumerable<string> Terms(string word)
    {
        var parts = WordBoundaries.Segments(word).Where(s => TermNormalizer.Normalize(s).Length > 0).ToList();
        foreach (var part in parts)
        {
            yield return part;
        }

        if (parts.Count > 1)
        {
            yield return word;
        }
    }

    /// <summary>The unit vector of one term, or null when nothing of it survives normalisation.</summary>
    internal float[]? TermVector(string word, Dictionary<string, float[]?> cache)
    {
        if (cache.TryGetValue(word, out var cached))
        {
            return cached;
        }

        var term = TermNormalizer.Normalize(word);
        float[]? vector = null;
        if (term.Length > 0)
        {
            Span<int> sums = stackalloc int[dimensions];
            AddFeature(TermFeature, term, sums);
            if (nGramLength > 0)
            {
                var runes = (WordStart + term + WordEnd).EnumerateRunes().Select(r => r.ToString()).ToArray();
                for (var start = 0; start + nGramLength <= runes.Length || start == 0; start++)
                {
                    AddFeature(NGramFeature, string.Concat(runes.Skip(start).Take(nGramLength)), sums);
                }
            }

            vector = Normalise(sums, term);
        }

        cache[word] = vector;
        return vector;
    }

    private void AddFeature(byte kind, string text, Span<int> sums)
    {
        var bytes = FeatureBytes(kind, text);
        for (var probe = 0; probe < probes; probe++)
        {
            var (bucket, sign) = Probe(bytes, probe);
            sums[bucket] += sign;
        }
    }

    // Hashed bytes: seed (8, little-endian) ‖ probe (2, little-endian) ‖ kind (1) ‖ UTF-8 of the feature.
    private byte[] FeatureBytes(byte kind, string text)
    {
        var bytes = new byte[11 + System.Text.Encoding.UTF8.GetByteCount(text)];
        BinaryPrimitives.WriteUInt64LittleEndian(bytes, seed);
        bytes[10] = kind;
        System.Text.Encoding.UTF8.GetBytes(text, bytes.AsSpan(11));
        return bytes;
    }

    // Bucket from the xor-folded hash, sign from the top bit (independent of the bucket bits).
    private (int Bucket, int Sign) Probe(byte[] bytes, int probe)
    {
        BinaryPrimitives.WriteUInt16LittleEndian(bytes.AsSpan(8), (ushort)probe);
        var hash = Fnv1a64.Hash(bytes);
        return ((int)((hash ^ (hash >> 32)) % (ulong)dimensions), (hash >> 63) == 0 ? 1 : -1);
    }

    private float[] Normalise(Span<int> sums, string term)
    {
        long squares = 0;
        foreach (var s in sums)
        {
            squares += (long)s * s;
        }

        if (squares == 0)
        {
            // Every probe cancelled (possible, if rare): the whole-term feature's first probe alone stands for the term.
            var (bucket, sign) = Probe(FeatureBytes(TermFeature, term), 0);
            sums[bucket] = sign;
            squares = 1;
        }

        var scale = 1.0 / Math.Sqrt(squares);
        var vector = new float[dimensions];
        for (var i = 0; i < dimensions; i++)
        {
            vector[i] = (float)(sums[i] * scale);
        }

        return vector;
    }

    private float[] Flatten(List<float[]> vectors)
    {
        var flat = new float[vectors.Count * dimensions];
        for (var i = 0; i < vectors.Count; i++)
        {
            vectors[i].CopyTo(flat, i * dimensions);
        }

        return flat;
    }
}
