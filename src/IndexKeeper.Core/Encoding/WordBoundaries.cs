using P = IndexKeeper.Core.Encoding.WordBreakProperty;

namespace IndexKeeper.Core.Encoding;

/// <summary>
/// Word boundaries of Unicode Standard Annex #29 ("Unicode Text Segmentation", Unicode 15.0, rules WB1–WB999),
/// from the pinned tables in <see cref="WordBreakTables"/> rather than the runtime's, so text splits the same
/// on every platform. Checked against the Unicode Consortium's WordBreakTest.txt (tests).
/// </summary>
internal static class WordBoundaries
{
    private static readonly (int First, int Last, int Value)[] Properties = UnicodeRanges.Parse(WordBreakTables.Properties);
    private static readonly (int First, int Last, int Value)[] Pictographic = UnicodeRanges.Parse(WordBreakTables.ExtendedPictographic);

    /// <summary>The segments of <paramref name="text"/> between its word boundaries, in order (spaces and punctuation included).</summary>
    public static List<string> Segments(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var starts = new List<int>(text.Length);
        var codePoints = new List<int>(text.Length);
        for (var i = 0; i < text.Length; i += char.IsSurrogatePair(text, i) ? 2 : 1)
        {
            starts.Add(i);
            codePoints.Add(char.IsSurrogatePair(text, i) ? char.ConvertToUtf32(text, i) : text[i]);
        }

        var segments = new List<string>();
        var from = 0;
        foreach (var boundary in Boundaries(codePoints))
        {
            var end = boundary < starts.Count ? starts[boundary] : text.Length;
            if (end > from)
            {
                segments.Add(text[from..end]);
            }

            from = end;
        }

        return segments;
    }

    /// <summary>Indexes of the code points a boundary falls before (the end, <c>codePoints.Count</c>, included; the start left out).</summary>
    public static IEnumerable<int> Boundaries(IReadOnlyList<int> codePoints)
    {
        ArgumentNullException.ThrowIfNull(codePoints);
        var n = codePoints.Count;
        var p = new P[n];
        for (var i = 0; i < n; i++)
        {
            p[i] = (P)UnicodeRanges.Lookup(Properties, codePoints[i]);
        }

        for (var i = 1; i < n; i++)
        {
            if (Breaks(p, codePoints, i))
            {
                yield return i;
            }
        }

        if (n > 0)
        {
            yield return n;
        }
    }

    /// <summary>Whether a boundary falls between code point <paramref name="i"/> − 1 and <paramref name="i"/>.</summary>
    private static bool Breaks(P[] p, IReadOnlyList<int> codePoints, int i)
    {
        var (before, after) = (p[i - 1], p[i]);
        if (before == P.CarriageReturn && after == P.LineFeed)
        {
            return false; // WB3
        }

        if (IsNewline(before) || IsNewline(after))
        {
            return true; // WB3a, WB3b
        }

        if (before == P.ZeroWidthJoiner && UnicodeRanges.Lookup(Pictographic, codePoints[i]) != 0)
        {
            return false; // WB3c
        }

        if (before == P.WSegSpace && after == P.WSegSpace)
        {
            return false; // WB3d
        }

        if (IsIgnorable(after))
        {
            return false; // WB4: Extend, Format and ZWJ attach to what precedes them
        }

        // WB4: the rules below see a character with its attached Extend/Format/ZWJ as that character.
        var left = Owner(p, i - 1);
        var leftBefore = left > 0 ? Owner(p, left - 1) : -1;
        var right = i + 1;
        while (right < p.Length && IsIgnorable(p[right]))
        {
            right++;
        }

        var (a, b) = (p[left], after);
        var beforeA = leftBefore >= 0 ? p[leftBefore] : P.Other;
        var afterB = right < p.Length ? p[right] : P.Other;
        return !(
            (IsAHLetter(a) && IsAHLetter(b)) // WB5
            || (IsAHLetter(a) && (b == P.MidLetter || IsMidNumLetQ(b)) && IsAHLetter(afterB)) // WB6
            || (IsAHLetter(beforeA) && (a == P.MidLetter || IsMidNumLetQ(a)) && IsAHLetter(b)) // WB7
            || (a == P.HebrewLetter && b == P.SingleQuote) // WB7a
            || (a == P.HebrewLetter && b == P.DoubleQuote && afterB == P.HebrewLetter) // WB7b
            || (beforeA == P.HebrewLetter && a == P.DoubleQuote && b == P.HebrewLetter) // WB7c
            || (a == P.Numeric && b == P.Numeric) // WB8
            || (IsAHLetter(a) && b == P.Numeric) // WB9
            || (a == P.Numeric && IsAHLetter(b)) // WB10
            || (beforeA == P.Numeric && (a == P.MidNum || IsMidNumLetQ(a)) && b == P.Numeric) // WB11
            || (a == P.Numeric && (b == P.MidNum || IsMidNumLetQ(b)) && afterB == P.Numeric) // WB12
            || (a == P.Katakana && b == P.Katakana) // WB13
            || ((IsAHLetter(a) || a is P.Numeric or P.Katakana or P.ExtendNumLet) && b == P.ExtendNumLet) // WB13a
            || (a == P.ExtendNumLet && (IsAHLetter(b) || b is P.Numeric or P.Katakana)) // WB13b
            || (a == P.RegionalIndicator && b == P.RegionalIndicator && RegionalIndicatorsEndingAt(p, left) % 2 == 1)); // WB15, WB16
    }

    /// <summary>The character an ignorable at <paramref name="j"/> is attached to (WB4); itself when nothing precedes it but a line break.</summary>
    private static int Owner(P[] p, int j)
    {
        while (j > 0 && IsIgnorable(p[j]) && !IsNewline(p[j - 1]))
        {
            j--;
        }

        return j;
    }

    private static int RegionalIndicatorsEndingAt(P[] p, int j)
    {
        var count = 0;
        while (j >= 0 && p[j] == P.RegionalIndicator)
        {
            count++;
            j = j > 0 ? Owner(p, j - 1) : -1;
        }

        return count;
    }

    private static bool IsNewline(P property) => property is P.Newline or P.CarriageReturn or P.LineFeed;

    private static bool IsIgnorable(P property) => property is P.Extend or P.Format or P.ZeroWidthJoiner;

    private static bool IsAHLetter(P property) => property is P.ALetter or P.HebrewLetter;

    private static bool IsMidNumLetQ(P property) => property is P.MidNumLet or P.SingleQuote;
}
