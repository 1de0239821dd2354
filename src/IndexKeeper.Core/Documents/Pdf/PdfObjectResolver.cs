using UglyToad.PdfPig.Core;
using UglyToad.PdfPig.Tokens;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// Resolves indirect references of one document, caching every lookup: with a damaged cross-reference
/// table each lookup of the parser is slow (measured: one damaged file 7.5 s without the cache, 1.5 s with).
/// A reference to a missing object is null (ISO 32000-1 §7.3.10).
/// </summary>
internal sealed class PdfObjectResolver(UglyToad.PdfPig.Structure structure)
{
    // A reference whose object is itself a reference is legal but pointless; longer chains than this
    // are hostile (a 20,000-link chain was seen in tests of the parser).
    private const int MaxChain = 32;

    private readonly Dictionary<IndirectReference, IToken?> cache = [];

    /// <summary>The direct object behind <paramref name="token"/>, following references.</summary>
    public IToken? Resolve(IToken? token)
    {
        for (var links = 0; token is IndirectReferenceToken reference; links++)
        {
            if (links == MaxChain)
            {
                throw new DocumentReadException(QuarantineReason.Corrupt, $"a chain of more than {MaxChain} indirect references at {reference.Data}");
            }

            token = Lookup(reference.Data);
        }

        return token is NullToken ? null : token;
    }

    public T? Resolve<T>(IToken? token)
        where T : class, IToken => Resolve(token) as T;

    /// <summary>Value of <paramref name="key"/> in <paramref name="dictionary"/>, resolved.</summary>
    public IToken? Get(DictionaryToken? dictionary, string key) =>
        dictionary is not null && dictionary.Data.TryGetValue(key, out var value) ? Resolve(value) : null;

    public T? Get<T>(DictionaryToken? dictionary, string key)
        where T : class, IToken => Get(dictionary, key) as T;

    private IToken? Lookup(IndirectReference reference)
    {
        if (!cache.TryGetValue(reference, out var value))
        {
            try
            {
                value = structure.GetObject(reference)?.Data;
            }
            catch (Exception e) when (e is not (OutOfMemoryException or OperationCanceledException))
            {
                // The parser throws for an object it cannot find or parse; the standard makes such a
                // reference null, and the parser's own page loading treats it the same way.
                value = null;
            }

            cache[reference] = value;
        }

        return value;
    }
}
