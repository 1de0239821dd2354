using System.Globalization;
using System.Text;

namespace IndexKeeper.Core.Encoding;

/// <summary>
/// Term normalisation of the hashed-term scheme: Unicode NFKC (UAX #15), simple case folding, then only
/// letters, marks and digits kept. It uses the pinned Unicode 15.0.0 tables in <see cref="UnicodeTables"/>
/// rather than the runtime's, so a term normalises the same on every platform and runtime version.
/// </summary>
internal static class TermNormalizer
{
    // Hangul syllable arithmetic, Unicode Standard chapter 3.12.
    private const int SBase = 0xAC00, LBase = 0x1100, VBase = 0x1161, TBase = 0x11A7;
    private const int LCount = 19, VCount = 21, TCount = 28, NCount = VCount * TCount, SCount = LCount * NCount;

    private static readonly Dictionary<int, int[]> Decompositions = ParseMap(UnicodeTables.Decompositions, v => v.Split(' ').Select(Hex).ToArray());
    private static readonly Dictionary<int, int> CaseFolds = ParseMap(UnicodeTables.CaseFolds, Hex);
    private static readonly Dictionary<long, int> Compositions = ParseCompositions();
    private static readonly (int First, int Last, int Value)[] CombiningClasses = UnicodeRanges.Parse(UnicodeTables.CombiningClasses);
    private static readonly (int First, int Last, int Value)[] Kept = UnicodeRanges.Parse(UnicodeTables.KeptRanges);

    /// <summary>The normalised term, possibly empty (a word of punctuation only).</summary>
    public static string Normalize(string word)
    {
        ArgumentNullException.ThrowIfNull(word);
        if (IsAscii(word))
        {
            return NormalizeAscii(word);
        }

        var output = new StringBuilder(word.Length);
        foreach (var codePoint in Nfkc(CodePoints(word)))
        {
            var folded = CaseFolds.TryGetValue(codePoint, out var f) ? f : codePoint;
            if (UnicodeRanges.Lookup(Kept, folded) != 0)
            {
                output.Append(char.ConvertFromUtf32(folded));
            }
        }

        return output.ToString();
    }

    /// <summary>
    /// Normalisation Form KD (UAX #15) with every character of non-zero canonical combining class dropped:
    /// accent stripping from the pinned tables, for the text-token encoder (the runtime's own decomposition
    /// does nothing under invariant globalisation).
    /// </summary>
    public static string ToNfkdWithoutMarks(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var buffer = new List<int>(text.Length + 4);
        foreach (var codePoint in CodePoints(text))
        {
            Decompose(codePoint, buffer);
        }

        var output = new StringBuilder(buffer.Count);
        foreach (var codePoint in buffer)
        {
            if (UnicodeRanges.Lookup(CombiningClasses, codePoint) == 0)
            {
                output.Append(char.ConvertFromUtf32(codePoint));
            }
        }

        return output.ToString();
    }

    /// <summary>Normalisation Form KC of a string (UAX #15): full compatibility decomposition, canonical order, canonical composition.</summary>
    public static string ToNfkc(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var output = new StringBuilder(text.Length);
        foreach (var codePoint in Nfkc(CodePoints(text)))
        {
            output.Append(char.ConvertFromUtf32(codePoint));
        }

        return output.ToString();
    }

    private static List<int> Nfkc(List<int> input)
    {
        var buffer = new List<int>(input.Count + 4);
        foreach (var codePoint in input)
        {
            Decompose(codePoint, buffer);
        }

        SortCanonically(buffer);
        Compose(buffer);
        return buffer;
    }

    private static void Decompose(int codePoint, List<int> output)
    {
        var s = codePoint - SBase;
        if (s is >= 0 and < SCount)
        {
            output.Add(LBase + (s / NCount));
            output.Add(VBase + (s % NCount / TCount));
            if (s % TCount != 0)
            {
                output.Add(TBase + (s % TCount));
            }
        }
        else if (Decompositions.TryGetValue(codePoint, out var mapping))
        {
            output.AddRange(mapping);
        }
        else
        {
            output.Add(codePoint);
        }
    }

    // Stable sort of each run of non-starters by combining class (canonical ordering algorithm).
    private static void SortCanonically(List<int> buffer)
    {
        for (var i = 1; i < buffer.Count; i++)
        {
            var current = buffer[i];
            var currentClass = UnicodeRanges.Lookup(CombiningClasses, current);
            if (currentClass == 0)
            {
                continue;
            }

            var j = i;
            while (j > 0 && UnicodeRanges.Lookup(CombiningClasses, buffer[j - 1]) > currentClass)
            {
                buffer[j] = buffer[j - 1];
                j--;
            }

            buffer[j] = current;
        }
    }

    // Canonical composition algorithm: a character joins the last starter unless a character between
    // them has combining class 0 or at least its own.
    private static void Compose(List<int> buffer)
    {
        if (buffer.Count == 0)
        {
            return;
        }

        var starterPosition = 0;
        var starter = buffer[0];
        var lastClass = UnicodeRanges.Lookup(CombiningClasses, starter) == 0 ? 0 : 256;
        var written = 1;
        for (var read = 1; read < buffer.Count; read++)
        {
            var current = buffer[read];
            var currentClass = UnicodeRanges.Lookup(CombiningClasses, current);
            var composite = ComposePair(starter, current);
            if (composite >= 0 && (lastClass < currentClass || lastClass == 0))
            {
                buffer[starterPosition] = composite;
                starter = composite;
                continue;
            }

            if (currentClass == 0)
            {
                starterPosition = written;
                starter = current;
            }

            lastClass = currentClass;
            buffer[written++] = current;
        }

        buffer.RemoveRange(written, buffer.Count - written);
    }

    private static int ComposePair(int first, int second)
    {
        var l = first - LBase;
        var v = second - VBase;
        if (l is >= 0 and < LCount && v is >= 0 and < VCount)
        {
            return SBase + (((l * VCount) + v) * TCount);
        }

        var s = first - SBase;
        var t = second - TBase;
        if (s is >= 0 and < SCount && s % TCount == 0 && t is > 0 and < TCount)
        {
            return first + t;
        }

        return Compositions.TryGetValue(PairKey(first, second), out var composite) ? composite : -1;
    }

    private static bool IsAscii(string word)
    {
        foreach (var c in word)
        {
            if (c > 0x7F)
            {
                return false;
            }
        }

        return true;
    }

    // ASCII is its own NFKC; of it only letters and digits are kept, and A-Z fold to a-z.
    private static string NormalizeAscii(string word) =>
        string.Create(word.Count(char.IsAsciiLetterOrDigit), word, static (span, source) =>
        {
            var i = 0;
            foreach (var c in source)
            {
                if (char.IsAsciiLetterOrDigit(c))
                {
                    span[i++] = char.ToLowerInvariant(c);
                }
            }
        });

    private static List<int> CodePoints(string text)
    {
        var result = new List<int>(text.Length);
        foreach (var rune in text.EnumerateRunes())
        {
            result.Add(rune.Value);
        }

        return result;
    }

    private static long PairKey(int first, int second) => ((long)first << 21) | (uint)second;

    private static Dictionary<int, T> ParseMap<T>(string table, Func<string, T> value) =>
        Entries(table).Select(e => e.Split('>')).ToDictionary(p => Hex(p[0]), p => value(p[1]));

    private static Dictionary<long, int> ParseCompositions() =>
        Entries(UnicodeTables.Compositions).Select(e => e.Split('>')).ToDictionary(
            p => PairKey(Hex(p[0].Split(' ')[0]), Hex(p[0].Split(' ')[1])),
            p => Hex(p[1]));

    private static IEnumerable<string> Entries(string table) => table.Split(';', StringSplitOptions.RemoveEmptyEntries);

    private static int Hex(string text) => int.Parse(text, NumberStyles.HexNumber, CultureInfo.InvariantCulture);
}
