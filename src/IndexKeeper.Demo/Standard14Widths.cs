using System.Collections.Concurrent;
using UglyToad.PdfPig.Fonts.Standard14Fonts;

namespace IndexKeeper.Demo;

/// <summary>
/// Glyph advance widths of a standard 14 font from its Adobe font metrics (1/1000 em), by character code.
/// Summing these is exact for the builder's standard 14 text, which has no kerning, and thousands of times
/// faster than asking the page builder to lay out letters for every candidate line.
/// </summary>
internal static class Standard14Widths
{
    private static readonly ConcurrentDictionary<Standard14Font, double[]> Tables = new();

    public static double Measure(Standard14Font font, string text, double size)
    {
        double[] table = Tables.GetOrAdd(font, Load);
        double total = 0;
        foreach (char character in text)
        {
            if (character >= table.Length || table[character] == 0)
            {
                throw new ArgumentException($"character U+{(int)character:X4} is not in the demo's plain ASCII set", nameof(text));
            }

            total += table[character];
        }

        return total * size / 1000;
    }

    private static double[] Load(Standard14Font font)
    {
        var table = new double[128];
        foreach (var metric in Standard14.GetAdobeFontMetrics(font).CharacterMetrics.Values)
        {
            // Printable ASCII has the same codes in the fonts' standard encoding, but for the two quotes.
            if (metric.CharacterCode is >= 32 and < 127 and not '\'' and not '`')
            {
                table[metric.CharacterCode] = metric.Width.X;
            }
        }

        return table;
    }
}
