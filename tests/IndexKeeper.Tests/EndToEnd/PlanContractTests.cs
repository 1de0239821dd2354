using System.Globalization;
using System.Security.Cryptography;
using System.Text.Json;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// <c>plan --json</c> on the real executable: the contract fields, agreement with the scan that follows
/// (a dry run must predict the real pass), and that the plan writes nothing to the catalog.
/// </summary>
public sealed class PlanContractTests : IDisposable
{
    // Always open, so the finish is the start plus the encoder time; the zone is an IANA tz database id.
    private static readonly string[] Schedule = ["--Schedule:TimeZone=Europe/Berlin", "--Schedule:Windows:0=daily 00:00-24:00"];

    private static readonly TimeZoneInfo Berlin = TimeZoneInfo.FindSystemTimeZoneById("Europe/Berlin");

    private readonly CliIndex index = new("store");

    [Fact]
    public void Plan_predicts_the_scan_honours_the_json_contract_and_writes_nothing()
    {
        index.Put("store/manuals/pump-manual.pdf", StorePdfs.Document("pump", 5));
        index.Put("store/reports/audit-report.pdf", StorePdfs.Document("audit", 3));
        index.Put("store/cover-letter.pdf", StorePdfs.Document("letter", 2));

        // Before any sync: no history, so --calibrate times a few of the pending pages.
        var first = index.Json("plan", [.. Schedule, "--calibrate"]);
        CheckContract(first);
        ContractAssert.Counts(first, "plan before sync", ("documentsNew", 3), ("pagesToEmbed", 10), ("pagesFree", 0), ("pagesToRemove", 0), ("driftedPages", 0));
        Assert.Equal("calibration", first.GetProperty("throughputSource").GetString());
        Assert.True(first.GetProperty("bytesDelta").GetInt64() > 0);
        var rows = first.GetProperty("breakdown").EnumerateArray()
            .ToDictionary(r => r.GetProperty("folder").GetString()!, r => r.GetProperty("pagesToEmbed").GetInt64());
        Assert.Equal(new Dictionary<string, long> { ["manuals"] = 5, ["reports"] = 3, [""] = 2 }, rows);
        Assert.False(File.Exists(index.PathOf("index/catalog.db")));

        index.Json("sync");
        var idle = index.Json("plan", Schedule);
        CheckContract(idle);
        ContractAssert.Counts(idle, "plan after sync", ("pagesToEmbed", 0), ("pagesToRemove", 0), ("documentsUnchanged", 3));
        Assert.Equal("history", idle.GetProperty("throughputSource").GetString());
        Assert.Equal(Instant(idle, "generatedAt"), Instant(idle, "estimatedFinish"));

        // A copy (free), a deletion (3 pages to remove) and a new document (4 pages to embed).
        index.Put("store/archive/pump-manual.pdf", index.Get("store/manuals/pump-manual.pdf"));
        index.Delete("store/reports/audit-report.pdf");
        index.Put("store/reports/valve-report.pdf", StorePdfs.Document("valve", 4));
        var catalogBefore = SHA256.HashData(File.ReadAllBytes(index.PathOf("index/catalog.db")));
        var plan = index.Json("plan", Schedule);
        Assert.Equal(catalogBefore, SHA256.HashData(File.ReadAllBytes(index.PathOf("index/catalog.db"))));
        Assert.False(File.Exists(index.PathOf("index/catalog-log.db")));
        CheckContract(plan);
        ContractAssert.Counts(
            plan,
            "plan after changes",
            ("documentsNew", 1),
            ("documentsCopied", 1),
            ("documentsDeleted", 1),
            ("pagesNew", 4),
            ("pagesToEmbed", 4),
            ("pagesFree", 5),
            ("pagesToRemove", 3));

        // Always open: finish = start + the read of the new document + encoder time, in Berlin's offset for
        // that instant (IANA tz database).
        var seconds = plan.GetProperty("estimatedEncoderSeconds").GetDouble();
        Assert.Equal(4 * plan.GetProperty("encoderSecondsPerPage").GetDouble(), seconds, 9);
        var read = plan.GetProperty("readSeconds").GetDouble();
        Assert.True(read > 0);
        Assert.Equal(read, plan.GetProperty("readSecondsByKind").GetProperty("pdf").GetDouble(), 9);
        var finish = Instant(plan, "estimatedFinish");
        Assert.Equal(Berlin.GetUtcOffset(finish), finish.Offset);
        Assert.InRange((finish - Instant(plan, "generatedAt")).TotalSeconds, read + seconds - 0.001, read + seconds + 0.001);

        // The real pass that follows does what the plan said.
        var scan = index.Json("scan");
        ContractAssert.Counts(scan, "scan after plan", ("pagesNew", 4), ("pagesRemoved", 3), ("pagesReused", 5), ("documentsCopied", 1), ("documentsDeleted", 1));
    }

    [Fact]
    public void A_new_encoder_makes_every_page_drifted_migration_work_that_finishes_inside_a_window()
    {
        index.Put("store/manuals/pump-manual.pdf", StorePdfs.Document("pump", 4));
        index.Put("store/reports/audit-report.pdf", StorePdfs.Document("audit", 3));
        index.Json("sync");

        // Other dimensions give another encoder id: the stored vectors are all under the old one.
        var plan = index.Json("plan", "--Encoder:Dimensions=192", "--calibrate", "--Schedule:TimeZone=Europe/Berlin", "--Schedule:Windows:0=Sat 22:00-23:00");
        ContractAssert.Counts(plan, "plan under a new encoder", ("driftedPages", 7), ("driftedNotQueued", 7), ("pagesToEmbed", 7), ("pagesToRemove", 0));
        Assert.Equal(7, plan.GetProperty("work").GetProperty("migration").GetInt64());
        Assert.Equal(0, plan.GetProperty("work").GetProperty("fresh").GetInt64());
        var rows = plan.GetProperty("breakdown").EnumerateArray().ToDictionary(r => r.GetProperty("folder").GetString()!, r => r.GetProperty("pagesToEmbed").GetInt64());
        Assert.Equal(new Dictionary<string, long> { ["manuals"] = 4, ["reports"] = 3 }, rows);

        // Migration runs only inside the window: the finish is a Saturday between 22:00 and 23:00 in
        // Berlin (ISO 8601 local time with offset; offsets from the IANA tz database), within a week.
        var finish = Instant(plan, "estimatedFinish");
        var local = TimeZoneInfo.ConvertTime(finish, Berlin);
        Assert.Equal(Berlin.GetUtcOffset(finish), finish.Offset);
        Assert.Equal(DayOfWeek.Saturday, local.DayOfWeek);
        Assert.InRange(local.TimeOfDay, TimeSpan.FromHours(22), TimeSpan.FromHours(23));
        Assert.InRange((finish - Instant(plan, "generatedAt")).TotalDays, 0, 7);
    }

    [Fact]
    public void Terminal_table_names_the_figures_and_a_bad_window_exits_2_naming_it()
    {
        index.Put("store/manuals/pump-manual.pdf", StorePdfs.Document("pump", 2));
        var table = index.Run("plan", Schedule);
        Assert.Equal(0, table.ExitCode);
        Assert.Contains("To embed       2 page(s)", table.Stdout, StringComparison.Ordinal);
        Assert.Contains("throughput unknown", table.Stdout, StringComparison.Ordinal);
        Assert.Contains("manuals", table.Stdout, StringComparison.Ordinal);

        var bad = index.Run("plan", "--Schedule:Windows:0=Mon-Fri 19:00");
        Assert.Equal(2, bad.ExitCode);
        Assert.Contains("Schedule:Windows:0", bad.Stderr, StringComparison.Ordinal);
    }

    private static void CheckContract(JsonElement plan)
    {
        foreach (var field in new[] { "pagesToEmbed", "pagesFree", "pagesToRemove", "driftedPages", "bytesDelta" })
        {
            Assert.Equal(JsonValueKind.Number, plan.GetProperty(field).ValueKind);
        }

        Assert.Equal(JsonValueKind.Number, plan.GetProperty("estimatedEncoderSeconds").ValueKind);
        Assert.True(plan.GetProperty("compactionDue").ValueKind is JsonValueKind.True or JsonValueKind.False);

        // ISO 8601 date and time with an explicit offset (ISO 8601-1:2019, 5.4.2 / RFC 3339 profile).
        var finish = plan.GetProperty("estimatedFinish").GetString()!;
        Assert.Matches(@"^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d+)?[+-]\d{2}:\d{2}$", finish);
    }

    private static DateTimeOffset Instant(JsonElement plan, string field) =>
        DateTimeOffset.Parse(plan.GetProperty(field).GetString()!, CultureInfo.InvariantCulture, DateTimeStyles.RoundtripKind);

    public void Dispose() => index.Dispose();
}
