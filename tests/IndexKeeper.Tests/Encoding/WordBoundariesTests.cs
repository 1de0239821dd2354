using System.Globalization;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Encoding;

/// <summary>
/// Word boundaries (UAX #29) against the Unicode Consortium's own conformance file, WordBreakTest.txt of
/// Unicode 15.0.0 as Debian's unicode-data package installs it, and the pinned tables against the data files.
/// </summary>
public sealed class WordBoundariesTests
{
    private static readonly string TablesPath = Path.Combine(RepositoryRoot.Path, "src", "IndexKeeper.Core", "Encoding", "WordBreakTables.cs");

    [Fact]
    public void Checked_in_tables_match_the_unicode_character_database()
    {
        // Source: WordBreakProperty-15.0.0.txt and emoji-data.txt (Extended_Pictographic) of Debian's unicode-data.
        var expected = WordBreakTableSource.Build(UnicodeTableSource.DatabaseDirectory);
        if (Environment.GetEnvironmentVariable("INDEXKEEPER_WRITE_UNICODE_TABLES") == "1")
        {
            File.WriteAllText(TablesPath, expected);
        }

        Assert.Equal(expected, File.ReadAllText(TablesPath).ReplaceLineEndings("\n"));
        Assert.StartsWith("# WordBreakProperty-15.0.0.txt", File.ReadLines(Path.Combine(UnicodeTableSource.DatabaseDirectory, "auxiliary", "WordBreakProperty.txt")).First(), StringComparison.Ordinal);
    }

    [Fact]
    public void Every_line_of_the_unicode_word_break_test_file_splits_as_it_says()
    {
        // Source: WordBreakTest-15.0.0.txt (UAX #29 conformance test): ÷ marks a boundary, × none.
        var path = Path.Combine(UnicodeTableSource.DatabaseDirectory, "auxiliary", "WordBreakTest.txt");
        Assert.StartsWith("# WordBreakTest-15.0.0.txt", File.ReadLines(path).First(), StringComparison.Ordinal);
        var failures = new List<string>();
        var lines = 0;
        foreach (var raw in File.ReadLines(path))
        {
            var line = raw.Split('#')[0].Trim();
            if (line.Length == 0)
            {
                continue;
            }

            lines++;
            var tokens = line.Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries);
            var codePoints = new List<int>();
            var expected = new List<int>();
            foreach (var token in tokens.Skip(1))
            {
                if (token == "÷")
                {
                    expected.Add(codePoints.Count);
                }
                else if (token != "×")
                {
                    codePoints.Add(int.Parse(token, NumberStyles.HexNumber, CultureInfo.InvariantCulture));
                }
            }

            var actual = WordBoundaries.Boundaries(codePoints).ToList();
            if (!actual.SequenceEqual(expected))
            {
                failures.Add($"{line}  → got {string.Join(",", actual)}");
            }
        }

        Assert.True(lines > 1800, $"only {lines} test lines read");
        Assert.True(failures.Count == 0, $"{failures.Count} of {lines} lines differ:\n" + string.Join("\n", failures.Take(20)));
    }

    [Fact]
    public void Hyphenated_words_and_part_numbers_split_at_the_hyphen_and_identifiers_stay_whole()
    {
        // UAX #29: a hyphen-minus is none of MidLetter, MidNum, MidNumLet (WB6/WB7/WB11/WB12 do not hold);
        // letters and digits join (WB9, WB10); a full stop between digits does not break (WB11, WB12).
        Assert.Equal(["pre", "-", "filter"], WordBoundaries.Segments("pre-filter"));
        Assert.Equal(["A", "-", "113"], WordBoundaries.Segments("A-113"));
        Assert.Equal(["KESTREL53"], WordBoundaries.Segments("KESTREL53"));
        Assert.Equal(["3.14", " ", "don't"], WordBoundaries.Segments("3.14 don't"));
    }
}
