using System.Buffers;
using System.Security.Cryptography;
using TextEncoding = System.Text.Encoding;
using UglyToad.PdfPig.Core;
using UglyToad.PdfPig.Tokens;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// Content hashes of PDF objects (docs/page-keys.md, "Objects"): dictionaries with sorted keys and the
/// keys that do not show removed, references replaced by what they point to (so object numbers and
/// direct-versus-indirect placement do not count), streams by their data after the lossless filters.
/// Every composite value is written as its own hash; hashes of indirect objects are kept per document.
/// </summary>
internal sealed class PdfObjectHasher
{
    /// <summary>Keys that never change what a page shows: bookkeeping, metadata, structure and tree links.</summary>
    public static readonly IReadOnlySet<string> ExcludedKeys = new HashSet<string>(StringComparer.Ordinal)
    {
        "Length", "DL", "Parent", "Metadata", "StructParent", "StructParents", "PieceInfo", "LastModified", "ProcSet",
    };

    // Deeper nesting than this only comes from hostile files (arrays nested 100,000 deep were seen);
    // it would overflow this reader's own stack.
    private const int MaxDepth = 200;

    private static readonly IReadOnlySet<string> StreamKeys = new HashSet<string>(StringComparer.Ordinal)
    {
        "Filter", "DecodeParms", "F", "DP",
    };

    private readonly PdfObjectResolver resolver;
    private readonly long maxDecodedBytes;
    private readonly CancellationToken cancellationToken;
    private readonly Dictionary<IndirectReference, byte[]> memo = [];
    private readonly List<IndirectReference> path = [];
    private int depth;
    private int shallowestBackReference = int.MaxValue;

    public PdfObjectHasher(PdfObjectResolver resolver, long maxDecodedBytes, CancellationToken cancellationToken)
    {
        this.resolver = resolver;
        this.maxDecodedBytes = maxDecodedBytes;
        this.cancellationToken = cancellationToken;
    }

    public PdfObjectResolver Resolver => resolver;

    /// <summary>Writes one value: scalars in place, composites as their content hash.</summary>
    public void WriteValue(CanonicalWriter writer, IToken? token)
    {
        switch (token)
        {
            case null or NullToken:
                writer.Null();
                break;
            case IndirectReferenceToken reference:
                WriteReference(writer, reference.Data);
                break;
            case NumericToken number:
                writer.Number(CanonicalNumber.FromDouble(number.Data));
                break;
            case NameToken name:
                writer.Name(name.Data);
                break;
            case StringToken text:
                writer.String(text.GetBytes());
                break;
            case HexToken hex:
                writer.String(hex.Bytes);
                break;
            case BooleanToken boolean:
                writer.Boolean(boolean.Data);
                break;
            case ArrayToken or DictionaryToken or StreamToken:
                writer.Hash(HashComposite(token, ExcludedKeys));
                break;
            default:
                writer.Keyword(TextEncoding.UTF8.GetBytes(token.ToString() ?? string.Empty));
                break;
        }
    }

    /// <summary>The 32-byte content hash of any value.</summary>
    public byte[] HashOf(IToken? token)
    {
        var writer = new CanonicalWriter();
        WriteValue(writer, token);
        return writer.Sha256();
    }

    /// <summary>
    /// Hash of a stream, with <paramref name="excluded"/> keys left out of its dictionary: the kept
    /// dictionary, the filters that stay encoded, then the length and SHA-256 of the data after the
    /// lossless filters are undone.
    /// </summary>
    public byte[] HashStream(StreamToken stream, IReadOnlySet<string> excluded, string what)
    {
        Enter();
        try
        {
            var writer = new CanonicalWriter();
            writer.Byte(CanonicalWriter.StreamTag);
            WriteDictionaryBody(writer, stream.StreamDictionary, excluded, StreamKeys);
            var (lossless, kept) = PdfStreamDecoder.SplitChain(stream.StreamDictionary, resolver);
            writer.UInt32((uint)kept.Count);
            foreach (var filter in kept)
            {
                writer.Name(filter.Name);
                WriteValue(writer, filter.Parameters);
            }

            using var dataHash = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
            var (length, damaged) = CappedDrain.Run(
                PdfStreamDecoder.Open(stream.Data, lossless), maxDecodedBytes, dataHash, null, what, cancellationToken);
            writer.UInt64((ulong)length);
            writer.Raw(dataHash.GetHashAndReset());
            writer.Boolean(damaged);
            return writer.Sha256();
        }
        finally
        {
            depth--;
        }
    }

    /// <summary>The data of a stream after its lossless filters, in memory (content streams only).</summary>
    public (byte[] Data, bool Damaged) Decode(StreamToken stream, string what)
    {
        var (lossless, kept) = PdfStreamDecoder.SplitChain(stream.StreamDictionary, resolver);
        if (kept.Count > 0)
        {
            // A content stream behind an image codec cannot be drawn; treat its data as absent.
            return ([], true);
        }

        var copy = new ArrayBufferWriter<byte>();
        var (_, damaged) = CappedDrain.Run(PdfStreamDecoder.Open(stream.Data, lossless), maxDecodedBytes, null, copy, what, cancellationToken);
        return (copy.WrittenSpan.ToArray(), damaged);
    }

    /// <summary>Writes a dictionary's entries sorted by key, without the excluded keys.</summary>
    public void WriteDictionaryBody(CanonicalWriter writer, DictionaryToken dictionary, IReadOnlySet<string> excluded, IReadOnlySet<string>? alsoExcluded = null)
    {
        var keys = dictionary.Data.Keys
            .Where(k => !excluded.Contains(k) && (alsoExcluded is null || !alsoExcluded.Contains(k)))
            .OrderBy(k => k, StringComparer.Ordinal)
            .ToList();
        writer.UInt32((uint)keys.Count);
        foreach (var key in keys)
        {
            writer.Name(key);
            WriteValue(writer, dictionary.Data[key]);
        }
    }

    private void WriteReference(CanonicalWriter writer, IndirectReference reference)
    {
        var index = path.IndexOf(reference);
        if (index >= 0)
        {
            writer.BackReference(path.Count - index);
            shallowestBackReference = Math.Min(shallowestBackReference, index);
            return;
        }

        if (memo.TryGetValue(reference, out var known))
        {
            writer.Hash(known);
            return;
        }

        var target = resolver.Resolve(new IndirectReferenceToken(reference));
        if (target is not (ArrayToken or DictionaryToken or StreamToken))
        {
            WriteValue(writer, target);
            return;
        }

        var outer = shallowestBackReference;
        shallowestBackReference = int.MaxValue;
        path.Add(reference);
        byte[] hash;
        try
        {
            hash = HashComposite(target, ExcludedKeys);
        }
        finally
        {
            path.RemoveAt(path.Count - 1);
        }

        // Only a hash that does not lean on objects above this one on the path is the same from every entry.
        var inner = shallowestBackReference;
        if (inner >= path.Count)
        {
            memo[reference] = hash;
        }

        shallowestBackReference = Math.Min(outer, inner);
        writer.Hash(hash);
    }

    private byte[] HashComposite(IToken token, IReadOnlySet<string> excluded)
    {
        if (token is StreamToken stream)
        {
            return HashStream(stream, excluded, "a stream");
        }

        Enter();
        try
        {
            var writer = new CanonicalWriter();
            if (token is ArrayToken array)
            {
                writer.Byte(CanonicalWriter.ArrayTag);
                writer.UInt32((uint)array.Data.Count);
                foreach (var item in array.Data)
                {
                    WriteValue(writer, item);
                }
            }
            else
            {
                writer.Byte(CanonicalWriter.DictionaryTag);
                WriteDictionaryBody(writer, (DictionaryToken)token, excluded);
            }

            return writer.Sha256();
        }
        finally
        {
            depth--;
        }
    }

    private void Enter()
    {
        cancellationToken.ThrowIfCancellationRequested();
        if (++depth > MaxDepth)
        {
            throw new DocumentReadException(QuarantineReason.Corrupt, $"objects nested more than {MaxDepth} deep");
        }
    }
}
