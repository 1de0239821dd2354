namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// The index remembers its encoder (docs/encoders.md, "Which encoder a command uses"): with no encoder
/// setting anywhere, a command uses the index's own, so an index built with hashed-terms shows no phantom
/// migration and a plain sync re-embeds nothing; naming another encoder is a migration that plan prices
/// before any sync does it.
/// </summary>
public sealed class RememberedEncoderTests : IDisposable
{
    private const int Pages = 8;

    // No INDEXKEEPER_Encoder__Name: the shipped default (minilm) applies unless a setting names another.
    private readonly CliIndex index = new("store") { ShippedEncoder = true };

    [Fact]
    public void Commands_without_an_encoder_setting_keep_the_index_encoder_and_plan_prices_a_named_change()
    {
        index.Put("store/registers/intake.pdf", StorePdfs.Document("intake", 5));
        index.Put("store/registers/filter.pdf", StorePdfs.Document("filter", 3));
        ContractAssert.Counts(index.Json("sync", "--encoder", "hashed-terms"), "first sync", ("pagesEmbedded", Pages));

        var status = index.Json("status");
        Assert.Equal("hashed-terms", status.GetProperty("activeEncoder").GetString());
        Assert.Equal(status.GetProperty("activeEncoderId").GetString(), status.GetProperty("servingEncoderId").GetString());
        ContractAssert.Counts(status, "status without an encoder setting", ("pagesDrifted", 0), ("queued", 0));

        var plan = index.Json("plan");
        ContractAssert.Counts(plan, "plan without an encoder setting", ("driftedPages", 0), ("pagesToEmbed", 0));

        var sync = index.Json("sync");
        ContractAssert.Counts(sync, "sync without an encoder setting", ("pagesEmbedded", 0), ("pagesDrifted", 0));

        // Named explicitly: plan, which writes nothing, says what the change costs before a sync spends it.
        var change = index.Json("plan", "--encoder", "minilm");
        Assert.Equal("minilm", change.GetProperty("activeEncoder").GetString());
        ContractAssert.Counts(change, "plan of a named change", ("driftedPages", Pages), ("pagesToEmbed", Pages));
        Assert.Contains(change.GetProperty("notes").EnumerateArray(), n => n.GetString()!.StartsWith("Encoder change: the index serves hashed-terms", StringComparison.Ordinal));

        // The plan changed nothing: the index still keeps its own encoder.
        Assert.Equal("hashed-terms", index.Json("status").GetProperty("activeEncoder").GetString());
    }

    [Fact]
    public void A_setting_given_replaces_only_itself_and_a_migration_in_progress_is_carried_on()
    {
        index.Put("store/registers/intake.pdf", StorePdfs.Document("intake", 5));
        index.Put("store/registers/filter.pdf", StorePdfs.Document("filter", 3));
        index.Json("sync", "--encoder", "hashed-terms");

        // Only d is given: the name comes from the index, so this is hashed-terms at d=64, a migration.
        ContractAssert.Counts(index.Json("scan", "--Encoder:Dimensions=64"), "scan with d=64", ("pagesQueuedForMigration", Pages), ("pagesEmbedded", 0));

        // A plain sync carries on the migration the index was set to, not back to the old encoder.
        var sync = index.Json("sync");
        ContractAssert.Counts(sync, "plain sync during the migration", ("pagesEmbedded", Pages), ("pagesMigrated", Pages));
        Assert.True(sync.GetProperty("encoderSwitchedOver").GetBoolean());
        var encoders = index.Json("encoders");
        var active = encoders.GetProperty("encoders").EnumerateArray().Single(e => e.GetProperty("active").GetBoolean());
        Assert.Equal(64, active.GetProperty("dimensions").GetInt32());
        Assert.Equal("hashed-terms", active.GetProperty("name").GetString());
    }

    public void Dispose() => index.Dispose();
}
