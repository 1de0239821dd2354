using System.Diagnostics;
using System.Globalization;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Encoding;

public sealed class TermNormalizerTests
{
    private static readonly string TablesPath = Path.Combine(RepositoryRoot.Path, "src", "IndexKeeper.Core", "Encoding", "UnicodeTables.cs");

    [Fact]
    public void Checked_in_tables_match_the_unicode_character_database()
    {
        // Source: Unicode Character Database 15.0.0 as shipped by Debian's unicode-data package.
        RequireDatabase();
        var expected = UnicodeTableSource.Build(UnicodeTableSource.DatabaseDirectory);
        if (Environment.GetEnvironmentVariable("INDEXKEEPER_WRITE_UNICODE_TABLES") == "1")
        {
            File.WriteAllText(TablesPath, expected);
        }

        Assert.Equal(expected, File.ReadAllText(TablesPath).ReplaceLineEndings("\n"));
        Assert.Contains("# CaseFolding-" + UnicodeTables.Version + ".txt", File.ReadLines(Path.Combine(UnicodeTableSource.DatabaseDirectory, "CaseFolding.txt")).First(), StringComparison.Ordinal);
    }

    [Fact]
    public void Nfkc_passes_the_unicode_normalization_conformance_file()
    {
        // Source: NormalizationTest.txt of Unicode 15.0.0 (UAX #15 conformance test): for every line
        // c4 == toNFKC(c1) == toNFKC(c2) == toNFKC(c3) == toNFKC(c4) == toNFKC(c5); code points not in part 1 are their own NFKC.
        RequireDatabase();
        var listed = new HashSet<int>();
        var part = string.Empty;
        var checkedLines = 0;
        foreach (var raw in ReadCompressed(Path.Combine(UnicodeTableSource.DatabaseDirectory, "NormalizationTest.txt.bz2")))
        {
            var line = raw.Split('#')[0].Trim();
            if (line.StartsWith('@'))
            {
                part = line;
                continue;
            }

            if (line.Length == 0)
            {
                continue;
            }

            var columns = line.Split(';').Take(5).Select(Decode).ToArray();
            if (part == "@Part1")
            {
                listed.Add(char.ConvertToUtf32(columns[0], 0));
            }

            foreach (var column in columns)
            {
                Assert.Equal(Hex(columns[3]), Hex(TermNormalizer.ToNfkc(column)));
            }

            checkedLines++;
        }

        Assert.True(checkedLines > 19_000, $"only {checkedLines} conformance lines");
        for (var c = 0; c <= 0x10FFFF; c++)
        {
            if (c is >= 0xD800 and <= 0xDFFF || listed.Contains(c))
            {
                continue;
            }

            var single = char.ConvertFromUtf32(c);
            Assert.Equal(single, TermNormalizer.ToNfkc(single));
        }
    }

    [Theory]
    [InlineData("Water", "water")]
    [InlineData("pump-station,", "pumpstation")]
    [InlineData("(Harrowmere)", "harrowmere")]
    [InlineData("\uFB01lter", "filter")] // U+FB01 LATIN SMALL LIGATURE FI decomposes <compat> to "fi" (UnicodeData.txt).
    [InlineData("\uFF37\uFF41\uFF54\uFF45\uFF52", "water")] // fullwidth forms decompose <wide> to ASCII (UnicodeData.txt).
    [InlineData("\u2163", "iv")] // U+2163 ROMAN NUMERAL FOUR decomposes <compat> to "IV" (UnicodeData.txt).
    [InlineData("Cafe\u0301", "caf\u00E9")] // e + COMBINING ACUTE composes to U+00E9 (UnicodeData.txt canonical decomposition).
    [InlineData("\u03A3\u039F\u03A6\u039F\u03A3", "\u03C3\u03BF\u03C6\u03BF\u03C3")] // capital sigma folds to U+03C3 (CaseFolding.txt).
    [InlineData("\u03C3\u03BF\u03C6\u03BF\u03C2", "\u03C3\u03BF\u03C6\u03BF\u03C3")] // final sigma U+03C2 folds to U+03C3 (CaseFolding.txt).
    [InlineData("\u212A", "k")] // KELVIN SIGN: canonical singleton decomposition to K (UnicodeData.txt), folded to k.
    [InlineData("\u2014\u00A7!", "")]
    [InlineData("\U0001D400", "a")] // MATHEMATICAL BOLD CAPITAL A decomposes <font> to A (UnicodeData.txt).
    public void Normalize_applies_nfkc_case_folding_and_strips_punctuation(string word, string expected) =>
        Assert.Equal(expected, TermNormalizer.Normalize(word));

    private static void RequireDatabase() =>
        Assert.True(
            File.Exists(Path.Combine(UnicodeTableSource.DatabaseDirectory, "UnicodeData.txt")),
            "the Unicode Character Database is missing: apt-get install unicode-data");

    private static IEnumerable<string> ReadCompressed(string path)
    {
        // bzip2 from Debian decompresses the conformance file as shipped.
        using var process = Process.Start(new ProcessStartInfo("bzcat", [path]) { RedirectStandardOutput = true })
            ?? throw new InvalidOperationException("bzcat did not start");
        var lines = new List<string>();
        while (process.StandardOutput.ReadLine() is { } line)
        {
            lines.Add(line);
        }

        process.WaitForExit();
        Assert.Equal(0, process.ExitCode);
        return lines;
    }

    private static string Decode(string column) =>
        string.Concat(column.Trim().Split(' ').Select(h => char.ConvertFromUtf32(int.Parse(h, NumberStyles.HexNumber, CultureInfo.InvariantCulture))));

    private static string Hex(string text) => string.Join(' ', text.EnumerateRunes().Select(r => r.Value.ToString("X4", CultureInfo.InvariantCulture)));

}
