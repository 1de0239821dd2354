using System.Globalization;
using System.Text.Json;
using IndexKeeper.Tests.Readers;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// A month of churn on a mixed team drive, through the real executable as an operator runs it: office files
/// (converted by LibreOffice), text-like files, scans (OCR) and letters. Day 1 is a busy day: it re-saves
/// every letter with only its metadata changed, edits one letter's first line, copies the scans into an
/// archive folder, renames the text files and rewrites the office files with identical bytes. Days 2–30 are
/// routine (<see cref="Routine"/>): letters re-saved and edited on weekdays, new letters and reports, copies,
/// moves, deletions and identical rewrites, quiet weekends. Each day's encoder calls are compared, in the
/// same run, with what re-embedding every changed file (file-level hashing) and a nightly re-embed of
/// everything would cost; reading time (conversion, OCR) is reported by kind from the pass.
/// </summary>
public sealed class MixedDriveBenchmark : IBenchmark
{
    private const int LetterPages = 2;

    private const int ReportPages = 8;

    private static readonly DateTime Monday = new(2031, 3, 10, 9, 0, 0, DateTimeKind.Utc);

    /// <summary>The letters on the drive now, by number, with the first line each shows (re-saves keep it).</summary>
    private readonly Dictionary<int, string> lines = [];

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
            lines[i] = FirstLine(i);
            File.WriteAllBytes(LetterPath(drive, i), OfficeSamples.Letter("R. Tamsett", Monday, lines[i]));
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
        lines[0] = FirstLine(0).Replace("season", "seasons", StringComparison.Ordinal);
        File.WriteAllBytes(LetterPath(drive, 0), OfficeSamples.Letter("J. Oakhurst", Monday.AddDays(1), lines[0]));
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
        context.Note("expected on day 1: 1 encoder call (the edited letter's first page); re-saved letters cost a conversion each and no encoder call");

        var days = context.Quick ? 5 : 30;
        var month = new MonthTotals(ours, fileLevel, pages, day.GetProperty("readSeconds").GetDouble());
        for (var d = 2; d <= days; d++)
        {
            var routine = Routine(drive, d, office, scans);
            var summary = Sync(context.WorkDirectory);
            var embedded = summary.GetProperty("pagesEmbedded").GetInt64();
            var seen = summary.GetProperty("pagesSeen").GetInt64();
            month.Add(embedded, routine.FileLevelPages, seen, summary.GetProperty("readSeconds").GetDouble());
            context.Note(string.Create(CultureInfo.InvariantCulture,
                $"day {d} ({Monday.AddDays(d):ddd}): {routine.What}; encoder calls {embedded}, file-level {routine.FileLevelPages}, nightly {seen}; read {summary.GetProperty("readSeconds").GetDouble():0.0} s"));
        }

        context.Report($"days 1–{days}: encoder calls, IndexKeeper", month.Ours, "pages");
        context.Report($"days 1–{days}: encoder calls, file-level hashing", month.FileLevel, "pages");
        context.Report($"days 1–{days}: encoder calls, nightly re-embed", month.Nightly, "pages");
        context.Report($"days 1–{days}: ratio file-level / IndexKeeper", month.FileLevel / (double)Math.Max(month.Ours, 1), "x");
        context.Report($"days 1–{days}: ratio nightly / IndexKeeper", month.Nightly / (double)Math.Max(month.Ours, 1), "x");
        context.Report($"days 1–{days}: reading time, all kinds", month.ReadSeconds, "s");
    }

    /// <summary>
    /// Day <paramref name="d"/>'s routine changes (day 1 is a Tuesday). Weekdays: three letters re-saved with
    /// only their metadata changed and one letter's first line edited (the week's number: an edit that may add
    /// a glyph, so up to both pages). Mondays: a new two-page letter and a new eight-page report. Wednesdays: a
    /// scan copied into the archive and a text file moved into a folder of last year's logs. Fridays (first): an
    /// office file rewritten with identical bytes (a backup tool's touch) and the oldest letter deleted.
    /// Weekends: nothing. File-level hashing embeds every page of each new file and each file whose bytes changed.
    /// </summary>
    private (string What, long FileLevelPages) Routine(string drive, int d, Dictionary<string, List<string>> office, Dictionary<string, List<string>> scans)
    {
        var date = Monday.AddDays(d);
        var letters = lines.Keys.Order().ToList();
        if (date.DayOfWeek is DayOfWeek.Saturday or DayOfWeek.Sunday)
        {
            return ("weekend, no change", 0);
        }

        var what = new List<string>();
        long fileLevel = 0;
        if (date.DayOfWeek == DayOfWeek.Friday)
        {
            var touched = office.Values.SelectMany(f => f).ElementAt(d % office.Values.Sum(f => f.Count));
            File.WriteAllBytes(touched, File.ReadAllBytes(touched));
            lines.Remove(letters[0]);
            File.Delete(LetterPath(drive, letters[0]));
            letters.RemoveAt(0);
            what.Add("office file rewritten unchanged, oldest letter deleted");
        }

        var week = (d / 7) + 1;
        if (date.DayOfWeek == DayOfWeek.Monday)
        {
            var letter = letters[^1] + 1;
            lines[letter] = FirstLine(letter);
            File.WriteAllBytes(LetterPath(drive, letter), OfficeSamples.Letter("R. Tamsett", date, lines[letter]));
            File.WriteAllBytes(Path.Combine(drive, "office", string.Create(CultureInfo.InvariantCulture, $"weekly-{d:00}.docx")), OfficeSamples.Report(pages: ReportPages, seed: 100 + d));
            fileLevel += LetterPages + ReportPages;
            what.Add("new letter and report");
        }

        var changed = new HashSet<int>();
        for (var i = 0; i < 3; i++)
        {
            var letter = letters[(d * 3 + i) % letters.Count];
            changed.Add(letter);
            File.WriteAllBytes(LetterPath(drive, letter), OfficeSamples.Letter("J. Oakhurst", date.AddMinutes(i), lines[letter]));
        }

        var edited = letters[(d * 7) % letters.Count];
        changed.Add(edited);
        lines[edited] = string.Create(CultureInfo.InvariantCulture, $"Harbour board of Kellmarsh: berth allocation {edited} for week {week}");
        File.WriteAllBytes(LetterPath(drive, edited), OfficeSamples.Letter("J. Oakhurst", date.AddHours(1), lines[edited]));
        fileLevel += LetterPages * changed.Count;
        what.Add(string.Create(CultureInfo.InvariantCulture, $"letters {string.Join('/', changed.Order())} re-saved, {edited} edited"));

        if (date.DayOfWeek == DayOfWeek.Wednesday)
        {
            var scan = scans.Values.SelectMany(f => f).ElementAt(d % scans.Values.Sum(f => f.Count));
            File.Copy(scan, Path.Combine(drive, "archive", string.Create(CultureInfo.InvariantCulture, $"{d:00}-{Path.GetFileName(scan)}")));
            var logs = Directory.GetFiles(Path.Combine(drive, "text")).Order(StringComparer.Ordinal).ToList();
            var moved = logs[d % logs.Count];
            var old = Path.Combine(drive, "text", "2030");
            Directory.CreateDirectory(old);
            File.Move(moved, Path.Combine(old, Path.GetFileName(moved)));
            what.Add("scan copied, log moved");
        }

        return (string.Join(", ", what), fileLevel);
    }

    /// <summary>The month's sums: encoder calls of each of the three ways and IndexKeeper's reading time.</summary>
    private sealed class MonthTotals(long ours, long fileLevel, long nightly, double readSeconds)
    {
        public long Ours { get; private set; } = ours;

        public long FileLevel { get; private set; } = fileLevel;

        public long Nightly { get; private set; } = nightly;

        public double ReadSeconds { get; private set; } = readSeconds;

        public void Add(long ours, long fileLevel, long nightly, double readSeconds)
        {
            Ours += ours;
            FileLevel += fileLevel;
            Nightly += nightly;
            ReadSeconds += readSeconds;
        }
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
