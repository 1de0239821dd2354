using System.Globalization;
using System.Text;

namespace IndexKeeper.Churn.Report;

/// <summary>The report's tables in Markdown, ready for docs/benchmarks.md.</summary>
internal static class MarkdownTables
{
    public static string Write(MonthReport report)
    {
        var text = new StringBuilder();
        var month = report.Days.Where(d => d.Day > 0).ToList();
        text.AppendLine("| day type | days | pages changed (truth) | calls (a) | calls (b) | calls (c) | (a)/(c) | (b)/(c) | misses (c) | stale served (c) |");
        text.AppendLine("|---|---:|---:|---:|---:|---:|---:|---:|---:|---:|");
        foreach (var group in report.Days.GroupBy(d => d.DayType))
        {
            var list = group.ToList();
            Row(text, group.Key, list);
        }

        Row(text, "**month (days 1–" + N(month.Count) + ")**", month);
        text.AppendLine();
        text.AppendLine("| month totals (days 1–" + N(month.Count) + ") | (a) full re-embed | (b) file hashing | (c) IndexKeeper | (a)/(c) | (b)/(c) |");
        text.AppendLine("|---|---:|---:|---:|---:|---:|");
        Totals(text, "encoder page calls", month, d => d.EncoderCalls, v => N((long)v));
        Totals(text, "encoder seconds, hashed terms", month, d => d.HashedTermSeconds, v => F(v, 2));
        Totals(text, "encoder seconds, minilm (calls × measured s/page)", month, d => d.MiniLmSeconds, v => F(v, 0));
        Totals(text, "vector bytes written, MB", month, d => d.BytesWritten, v => F(v / 1e6, 1));
        text.AppendLine(string.Create(CultureInfo.InvariantCulture, $"| vector bytes on disk at the end, MB | {F(month[^1].FullReembed.BytesOnDisk / 1e6, 1)} | {F(month[^1].FileHashing.BytesOnDisk / 1e6, 1)} | {F(month[^1].IndexKeeper.BytesOnDisk / 1e6, 1)} (whole index directory) | | |"));
        text.AppendLine(string.Create(CultureInfo.InvariantCulture, $"| misses / stale vectors served | 0 / 0 (by construction) | 0 / 0 (by construction) | {N(month.Sum(d => d.IndexKeeper.Misses))} / {N(month.Sum(d => d.IndexKeeper.StaleServed))} (measured) | | |"));
        text.AppendLine();
        text.AppendLine("| day | type | files | pages | new contents | calls (a) | calls (b) | calls (c) | files read (c) | sync (c), s | space amp. (c) |");
        text.AppendLine("|---:|---|---:|---:|---:|---:|---:|---:|---:|---:|---:|");
        foreach (var d in report.Days)
        {
            text.AppendLine(string.Create(CultureInfo.InvariantCulture,
                $"| {d.Day} | {d.DayType} | {N(d.Files)} | {N(d.Pages)} | {N(d.NewContents)} | {N(d.FullReembed.EncoderCalls)} | {N(d.FileHashing.EncoderCalls)} | {N(d.IndexKeeper.EncoderCalls)} | {N(d.IndexKeeperFilesRead)} | {F(d.IndexKeeperSyncSeconds, 1)} | {F(d.IndexKeeperSpaceAmplification, 2)} |"));
        }

        return text.ToString();
    }

    private static void Row(StringBuilder text, string name, List<DayFigures> days)
    {
        long a = days.Sum(d => d.FullReembed.EncoderCalls), b = days.Sum(d => d.FileHashing.EncoderCalls), c = days.Sum(d => d.IndexKeeper.EncoderCalls);
        text.AppendLine(string.Create(CultureInfo.InvariantCulture,
            $"| {name} | {days.Count} | {N(days.Sum(d => d.NewContents))} | {N(a)} | {N(b)} | {N(c)} | {Ratio(a, c)} | {Ratio(b, c)} | {N(days.Sum(d => d.IndexKeeper.Misses))} | {N(days.Sum(d => d.IndexKeeper.StaleServed))} |"));
    }

    private static void Totals(StringBuilder text, string name, List<DayFigures> days, Func<StrategyDay, double> value, Func<double, string> format)
    {
        double a = days.Sum(d => value(d.FullReembed)), b = days.Sum(d => value(d.FileHashing)), c = days.Sum(d => value(d.IndexKeeper));
        text.AppendLine($"| {name} | {format(a)} | {format(b)} | {format(c)} | {Ratio(a, c)} | {Ratio(b, c)} |");
    }

    private static string Ratio(double x, double y) => y == 0 ? "—" : (x / y).ToString("0.0", CultureInfo.InvariantCulture) + "×";

    private static string N(long value) => value.ToString("N0", CultureInfo.InvariantCulture);

    private static string F(double value, int decimals) => double.IsNaN(value) ? "—" : value.ToString("N" + decimals.ToString(CultureInfo.InvariantCulture), CultureInfo.InvariantCulture);
}
