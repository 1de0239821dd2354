using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// Text pages encoded by the product's own hashed-term encoder (d = 128): words drawn from an invented
/// vocabulary with Zipf-like frequencies (rank r has weight 1/r, common practice for word counts), and
/// queries of a few words of one page, picked among its rarer words as a person searching would.
/// </summary>
internal sealed class TermCorpus
{
    private const int Vocabulary = 30_000;
    private readonly Random random;
    private readonly IPageEncoder encoder = HashedTermEncoderFactory.Create(new HashedTermEncoderOptions { Dimensions = 128 });
    private readonly string[] words;
    private readonly double[] cumulative;
    private readonly int minWords;
    private readonly int maxWords;
    private readonly int queryWords;
    private readonly Dictionary<int, string[]> pageWords = [];

    public TermCorpus(int seed, int minWords, int maxWords, int queryWords)
    {
        random = new Random(seed);
        this.minWords = minWords;
        this.maxWords = maxWords;
        this.queryWords = queryWords;
        words = Enumerable.Range(0, Vocabulary).Select(Word).ToArray();
        cumulative = new double[Vocabulary];
        var sum = 0.0;
        for (var r = 0; r < Vocabulary; r++)
        {
            sum += 1.0 / (r + 1);
            cumulative[r] = sum;
        }
    }

    public EncoderIdentity Identity => encoder.Identity;

    /// <summary>The vectors of page <paramref name="index"/> (pages are made once each, in any order).</summary>
    public VectorSet Page(int index) => PageAndWords(index).Vectors;

    /// <summary>
    /// Draws pages 0 to <paramref name="pages"/> − 1 as <see cref="PageAndWords"/> would, without encoding them:
    /// for an index written by an earlier run, so that queries and later pages come out the same.
    /// </summary>
    public void Replay(int pages)
    {
        for (var index = 0; index < pages; index++)
        {
            Words(index);
        }
    }

    /// <summary>The vectors of page <paramref name="index"/> and the placed words they were made from.</summary>
    public (VectorSet Vectors, PageWord[] Words) PageAndWords(int index) => PageAndWords(index, 0);

    /// <summary>
    /// As <see cref="PageAndWords(int)"/>, with each word drawn from a second, unseen vocabulary (the same Zipf
    /// ranks, other words) with probability <paramref name="newShare"/>: content whose words drift away from
    /// what the index held before.
    /// </summary>
    public (VectorSet Vectors, PageWord[] Words) PageAndWords(int index, double newShare)
    {
        var placed = Words(index, newShare);
        var page = new PageToEncode(PageKey.Of(BitConverter.GetBytes(index)), "generated", 1, 612, 792, placed);
        return (encoder.EncodePages([page], CancellationToken.None)[0], placed);
    }

    private PageWord[] Words(int index, double newShare = 0)
    {
        var count = random.Next(minWords, maxWords + 1);
        var text = new string[count];
        var placed = new PageWord[count];
        for (var w = 0; w < count; w++)
        {
            // With no new share no extra draw is made, so pages come out as before (Replay relies on it).
            text[w] = newShare > 0 && random.NextDouble() < newShare ? Word(Vocabulary + Draw()) : words[Draw()];
            placed[w] = new PageWord(text[w], new PageBox(w % 12 * 45, w / 12 * 14, (w % 12 * 45) + 40, (w / 12 * 14) + 12));
        }

        // Only the pages that queries target keep their words.
        if (index % 97 == 0)
        {
            pageWords[index] = text;
        }

        return placed;
    }

    /// <summary>A query of the page's rarer words; the page's index must be a multiple of 97.</summary>
    public VectorSet Query(int page)
    {
        var chosen = pageWords[page].Distinct().OrderByDescending(w => Array.IndexOf(words, w)).Take(queryWords * 3).OrderBy(_ => random.Next()).Take(queryWords);
        return encoder.EncodeQuery(string.Join(' ', chosen), CancellationToken.None);
    }

    private int Draw()
    {
        var target = random.NextDouble() * cumulative[^1];
        var at = Array.BinarySearch(cumulative, target);
        return at >= 0 ? at : Math.Min(~at, Vocabulary - 1);
    }

    // Pronounceable invented words: consonant–vowel syllables from the rank, so no two ranks share a word.
    private static string Word(int rank)
    {
        const string consonants = "bdfgklmnprstvz";
        const string vowels = "aeiou";
        var word = new System.Text.StringBuilder();
        var n = rank + 1;
        do
        {
            word.Append(consonants[n % consonants.Length]).Append(vowels[(n / consonants.Length) % vowels.Length]);
            n /= consonants.Length * vowels.Length;
        }
        while (n > 0);
        return word.ToString();
    }
}
