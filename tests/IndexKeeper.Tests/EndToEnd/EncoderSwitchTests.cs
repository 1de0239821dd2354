using System.Text.Json;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// Switching the configured encoder on the real executable: after a sync with one encoder, a configuration
/// with another d is a declared change; <c>encoders --json</c> and <c>status --json</c> show the old vectors
/// drifted and queued, searches keep ranking with the old encoder, the next sync migrates every page and
/// switches over, the old vectors die and compaction reclaims them, and a canary check finds no silent drift.
/// </summary>
public sealed class EncoderSwitchTests : IDisposable
{
    private const int Pages = 8;
    private const string NewEncoder = "--Encoder:Dimensions=64";

    private readonly CliIndex index = new("store");

    [Fact]
    public void A_declared_change_is_shown_drifted_and_queued_then_migrated_and_switched_over()
    {
        index.Put("store/registers/intake.pdf", StorePdfs.Document("intake", 5));
        index.Put("store/registers/filter.pdf", StorePdfs.Document("filter", 3));
        var first = index.Json("sync");
        ContractAssert.Counts(first, "first sync", ("pagesEmbedded", Pages), ("pagesDrifted", 0));
        var before = index.Json("encoders");
        var oldEncoder = Assert.Single(Entries(before));
        Assert.True(oldEncoder.GetProperty("active").GetBoolean() && oldEncoder.GetProperty("serving").GetBoolean());
        var oldId = oldEncoder.GetProperty("id").GetString()!;

        // The declared change: before any scan the old vectors still cover every page (verify is clean);
        // scan queues every page for migration and embeds nothing.
        index.Json("verify", NewEncoder);
        var scan = index.Json("scan", NewEncoder);
        ContractAssert.Counts(scan, "scan after the change", ("pagesDrifted", Pages), ("pagesQueuedForMigration", Pages), ("pagesEmbedded", 0));
        var drifted = index.Json("encoders", NewEncoder);
        Assert.True(drifted.GetProperty("migrating").GetBoolean());
        Assert.Equal(oldId, drifted.GetProperty("servingEncoderId").GetString());
        var old = Entry(drifted, oldId);
        ContractAssert.Counts(old, "old encoder while migrating", ("liveVectorSets", Pages), ("pagesDrifted", Pages));
        Assert.False(old.GetProperty("active").GetBoolean());
        var active = Entries(drifted).Single(e => e.GetProperty("active").GetBoolean());
        ContractAssert.Counts(active, "new encoder while migrating", ("liveVectorSets", 0), ("pagesMigrated", 0), ("pagesToMigrate", Pages));
        Assert.Equal(64, active.GetProperty("dimensions").GetInt32());
        var status = index.Json("status", NewEncoder);
        ContractAssert.Counts(status, "status while migrating", ("queued", Pages), ("pagesDrifted", Pages), ("liveVectorSets", Pages));

        // Searches during the migration rank with the old encoder: every page is still found.
        var search = index.Json("search", NewEncoder, "filter register entry 2");
        Assert.Equal(oldId, search.GetProperty("servingEncoderId").GetString());
        Assert.Equal(JsonValueKind.Null, search.GetProperty("notice").ValueKind);
        Assert.Equal("registers/filter.pdf", search.GetProperty("hits")[0].GetProperty("path").GetString());

        var sync = index.Json("sync", NewEncoder);
        ContractAssert.Counts(sync, "migrating sync", ("pagesEmbedded", Pages), ("pagesDrifted", 0), ("pagesMigrated", Pages));
        Assert.True(sync.GetProperty("encoderSwitchedOver").GetBoolean());

        var after = index.Json("encoders", NewEncoder);
        Assert.False(after.GetProperty("migrating").GetBoolean());
        var newId = after.GetProperty("activeEncoderId").GetString()!;
        Assert.Equal(newId, after.GetProperty("servingEncoderId").GetString());
        var retired = Entry(after, oldId);
        Assert.True(retired.GetProperty("retired").GetBoolean());
        ContractAssert.Counts(retired, "old encoder after the switch", ("liveVectorSets", 0), ("vectorSets", Pages));
        ContractAssert.Counts(Entry(after, newId), "new encoder after the switch", ("liveVectorSets", Pages));

        var compact = index.Json("compact", NewEncoder);
        Assert.True(ContractAssert.Long(compact, "bytesReclaimed") > 0);
        var searchAfter = index.Json("search", NewEncoder, "filter register entry 2");
        Assert.Equal(newId, searchAfter.GetProperty("servingEncoderId").GetString());
        Assert.Equal("registers/filter.pdf", searchAfter.GetProperty("hits")[0].GetProperty("path").GetString());
        index.Json("verify", NewEncoder);

        var canaries = index.Json("encoders", NewEncoder, "--check-canaries", "--Drift:CanaryPages=3");
        var canary = Entry(canaries, newId).GetProperty("canary");
        Assert.False(canary.GetProperty("drifted").GetBoolean());
        Assert.Equal(3, canary.GetProperty("pages").GetInt32());
        Assert.True(canary.GetProperty("minimumCosine").GetDouble() > 0.9999);
        Assert.False(index.Json("status", NewEncoder).GetProperty("canaryDrifted").GetBoolean());
    }

    public void Dispose() => index.Dispose();

    private static IEnumerable<JsonElement> Entries(JsonElement report) => report.GetProperty("encoders").EnumerateArray();

    private static JsonElement Entry(JsonElement report, string id) => Entries(report).Single(e => e.GetProperty("id").GetString() == id);
}
