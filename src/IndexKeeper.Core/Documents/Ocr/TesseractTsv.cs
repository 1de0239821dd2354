using System.Globalization;

namespace IndexKeeper.Core.Documents.Ocr;

/// <summary>
/// Parses Tesseract's TSV output (one row per layout element; columns level, page_num, block_num, par_num,
/// line_num, word_num, left, top, width, height, conf, text; level 5 rows are words, boxes in pixels from
/// the image's top-left corner, as Tesseract's documentation on output formats describes).
/// </summary>
internal static class TesseractTsv
{
    /// <summary>One recognised word: page number in a multi-page input (1-based), text and pixel box.</summary>
    public readonly record struct Word(int Page, string Text, int Left, int Top, int Width, int Height);

    private const int Columns = 12;
    private const int WordLevel = 5;

    /// <exception cref="FormatException">A row does not have the TSV layout.</exception>
    public static IEnumerable<Word> Parse(string tsv)
    {
        var lines = tsv.ReplaceLineEndings("\n").Split('\n');
        if (lines.Length == 0 || !lines[0].StartsWith("level\t", StringComparison.Ordinal))
        {
            throw new FormatException("Tesseract's output does not start with the TSV header row.");
        }

        foreach (var line in lines.Skip(1))
        {
            if (line.Length == 0)
            {
                continue;
            }

            var cells = line.Split('\t');
            if (cells.Length != Columns)
            {
                throw new FormatException($"A TSV row has {cells.Length} columns, not {Columns}: '{line}'.");
            }

            if (Number(cells[0]) != WordLevel || cells[11].Trim().Length == 0)
            {
                continue;
            }

            yield return new Word(Number(cells[1]), cells[11].Trim(), Number(cells[6]), Number(cells[7]), Number(cells[8]), Number(cells[9]));
        }
    }

    private static int Number(string cell) =>
        int.TryParse(cell, NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out var value)
            ? value
            : throw new FormatException($"'{cell}' is not a number in Tesseract's TSV output.");
}
