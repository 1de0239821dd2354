using System.Globalization;
using System.Text.Json;
using IndexKeeper.Tests.Readers;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// A day of churn on a mixed team drive, through the real executable as an operator runs it: office files
/// (converted by LibreOffice), text-like files, scans (OCR) and letters. The day re-saves every letter with
/// only its metadata changed, edits one letter's first line, copies the scans into an archive folder,
/// renames the text files and rewrites the office files with identical bytes. Encoder calls of the day are
/// compared, in the same run, with what re-embedding every changed file (file-level hashing) and a nightly
/// re-embed of everything would cost; reading time (conversion, OCR) is reported by kind from the pass.
/// </summary>
public sealed class MixedDriveBenchmark : IBenchmark
{
    private const int LetterPages = 2;

    private static readonly DateTime Monday = new(2031, 3, 10, 9, 0, 0, DateTimeKind.Utc);

    public string Name => "mixed-drive";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        var drive = Path.Combine(context.WorkDirectory, "drive");
        var copies = context.Quick ? 1 : 3;
        var letters = context.Quick ? 4 : 12;
        // Made beside the drive (LibreOffice's profile and the drawn pages stay there), then placed in it.
        var samples = Path.Combine(context.WorkDirectory, "samples");
        var office = Place(ReaderSamples.Office(Path.Combine(samples, "office"), copies), Path.Combine(drive, "office"));
        var text = Place(ReaderSamples.Text(Path.Combine(samples, "text"), context.Quick ? 3 : 10), Path.Combine(drive, "text"));
        var scans = Place(ReaderSamples.Scans(Path.Combine(samples, "scans"), copies), Path.Combine(drive, "scans"));
        Directory.CreateDirectory(Path.Combine(drive, "letters"));
        for (var i = 0; i < letters; i++)
        {
            File.WriteAllBytes(LetterPath(drive, i), OfficeSamples.Letter("R. Tamsett", Monday, FirstLine(i)));
        }

        var files = Directory.GetFiles(drive, "*", SearchOption.AllDirectories).Length;
        context.Note($"{files} files: {office.Values.Sum(f => f.Count)} office, {text.Values.Sum(f => f.Count)} text-like, {scans.Values.Sum(f => f.Count)} scans, {letters} two-page letters; encoder hashed-terms");

        var first = Sync(context.WorkDirectory);
        var pages = first.GetProperty("pagesSeen").GetInt64();
        context.Report("day 0: pages", pages, "pages");
        context.Report("day 0: encoder calls (pages embedded)", first.GetProperty("pagesEmbedded").GetInt64(), "pages");
        ReportReading(context, "day 0", first);

        // The day's churn. Re-saves change only metadata (author, times, revision): the pages show the same.
        for (var i = 0; i < letters; i++)
        {
            File.WriteAllBytes(LetterPath(drive, i), OfficeSamples.Letter("J. Oakhurst", Monday.AddDays(1).AddMinutes(i), FirstLine(i)));
        }

        // The edit uses only letters the document already shows: the converter embeds one font subset that
        // every page of the PDF shares, so an edit that adds or drops a glyph gives every page a new key
        // (docs/page-keys.md; "spring" → "winter" drops the only "g" and costs both pages).
        File.WriteAllBytes(LetterPath(drive, 0), OfficeSamples.Letter("J. Oakhurst", Monday.AddDays(1), FirstLine(0).Replace("season", "seasons", StringComparison.Ordinal)));
        var archive = Path.Combine(drive, "archive");
        Directory.CreateDirectory(archive);
        foreach (var scan in scans.Values.SelectMany(f => f))
        {
            File.Copy(scan, Path.Combine(archive, Path.GetFileName(scan)));
        }

        foreach (var path in text.Values.SelectMany(f => f))
        {
            File.Move(path, Path.Combine(Path.GetDirectoryName(path)!, "2031-" + Path.GetFileName(path)));
        }

        foreach (var path in office.Values.SelectMany(f => f))
        {
            File.WriteAllBytes(path, File.ReadAllBytes(path));
        }

        var day = Sync(context.WorkDirectory);
        var ours = day.GetProperty("pagesEmbedded").GetInt64();

        // Baselines of the same day: file-level hashing embeds every page of each file whose bytes changed
        // (the letters; copies, renames and identical rewrites keep their hash); a nightly run embeds all.
        var fileLevel = letters * LetterPages;
        context.Report("day 1: encoder calls, IndexKeeper", ours, "pages");
        context.Report("day 1: encoder calls, file-level hashing", fileLevel, "pages");
        context.Report("day 1: encoder calls, nightly re-embed", pages, "pages");
        context.Report("ratio file-level / IndexKeeper", fileLevel / (double)Math.Max(ours, 1), "x");
        context.Report("ratio nightly / IndexKeeper", pages / (double)Math.Max(ours, 1), "x");
        context.Report("day 1: documents read", day.GetProperty("documentsRead").GetInt64(), "documents");
        context.Report("day 1: documents copied or moved (no read)", day.GetProperty("documentsCopied").GetInt64(), "documents");
        ReportReading(context, "day 1", day);
        context.Note("expected: 1 encoder call (the edited letter's first page); re-saved letters cost a conversion each and no encoder call");
    }

    private static Dictionary<string, List<string>> Place(Dictionary<string, List<string>> made, string folder)
    {
        Directory.CreateDirectory(folder);
        return made.ToDictionary(
            m => m.Key,
            m => m.Value.Select(path =>
            {
                var placed = Path.Combine(folder, Path.GetFileName(path));
                File.Copy(path, placed);
                return placed;
            }).ToList(),
            StringComparer.Ordinal);
    }

    private static string LetterPath(string drive, int i) => Path.Combine(drive, "letters", string.Create(CultureInfo.InvariantCulture, $"berths-{i:00}.docx"));

    private static string FirstLine(int i) => string.Create(CultureInfo.InvariantCulture, $"Harbour board of Kellmarsh: berth allocation {i} for the spring season");

    private static void ReportReading(BenchmarkContext context, string day, JsonElement summary)
    {
        context.Report($"{day}: pass wall time", summary.GetProperty("elapsedSeconds").GetDouble(), "s");
        context.Report($"{day}: reading time, all kinds", summary.GetProperty("readSeconds").GetDouble(), "s");
        foreach (var kind in summary.GetProperty("readSecondsByKind").EnumerateObject())
        {
            context.Report($"{day}: reading time, {kind.Name}", kind.Value.GetDouble(), "s");
        }
    }

    /// <summary>One <c>sync --json</c> of the drive by the built executable; its summary.</summary>
    private static JsonElement Sync(string directory) =>
        CliJson.Run(directory, "sync", "--index", "index", "--root", "drive", "--encoder", "hashed-terms", "--json", "--Detect:SettleSeconds=0");
}
