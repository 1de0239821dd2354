using IndexKeeper.Core.Documents;
using Microsoft.ML.Tokenizers;

namespace IndexKeeper.Core.Encoding.TextTokens;

/// <summary>
/// A page's (or query's) word-piece token ids, without [CLS]/[SEP], and for each token the word it came
/// from. Words are tokenised one at a time: basic BERT tokenisation splits on white space first, so this
/// gives the ids of the joined text while keeping every token's word (and so its box).
/// </summary>
internal sealed class WordPieceSequence
{
    private WordPieceSequence(long[] ids, int[] words)
    {
        Ids = ids;
        Words = words;
    }

    public long[] Ids { get; }

    /// <summary>For each token, the index of its word in the input list.</summary>
    public int[] Words { get; }

    public int Count => Ids.Length;

    public static WordPieceSequence Create(BertTokenizer tokenizer, IReadOnlyList<string> words, Dictionary<string, int[]> cache)
    {
        ArgumentNullException.ThrowIfNull(tokenizer);
        ArgumentNullException.ThrowIfNull(words);
        var ids = new List<long>(words.Count * 2);
        var owners = new List<int>(words.Count * 2);
        for (var w = 0; w < words.Count; w++)
        {
            if (!cache.TryGetValue(words[w], out var pieces))
            {
                pieces = [.. Tokenize(tokenizer, words[w])];
                cache[words[w]] = pieces;
            }

            foreach (var id in pieces)
            {
                ids.Add(id);
                owners.Add(w);
            }
        }

        return new WordPieceSequence([.. ids], [.. owners]);
    }

    /// <summary>
    /// The word-piece ids of one word (or any text), no [CLS]/[SEP]. Non-ASCII text loses its accents first
    /// through the pinned Unicode tables, as the uncased vocabulary expects.
    /// </summary>
    public static IReadOnlyList<int> Tokenize(BertTokenizer tokenizer, string text)
    {
        var ascii = text.All(char.IsAscii);
        return tokenizer.EncodeToIds(ascii ? text : TermNormalizer.ToNfkdWithoutMarks(text), addSpecialTokens: false);
    }

    public static WordPieceSequence Create(BertTokenizer tokenizer, IReadOnlyList<PageWord> words, Dictionary<string, int[]> cache) =>
        Create(tokenizer, words.Select(word => word.Text).ToArray(), cache);
}
