using System.Text.Json;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Configuration;

/// <summary>
/// A root's name is its identity in the catalog: listing the roots in another order or moving a root's
/// folder changes nothing in the index, and an index built with derived names (<c>--root DIR</c>) reads
/// the same from a configuration that names no root (docs/cli.md, "Root names").
/// </summary>
public sealed class RootNameTests
{
    [Fact]
    public void Reordered_roots_and_a_moved_folder_under_their_names_cost_no_deletion_move_or_encoder_call()
    {
        using var temp = new TempDirectory();
        WriteTwoRoots(temp);
        var first = Sync(temp, Config(temp, ("north", "a/docs"), ("south", "b/docs")));
        Assert.Equal(4, first.GetProperty("documentsNew").GetInt32());
        Assert.True(first.GetProperty("pagesEmbedded").GetInt32() > 0);

        // The share is mounted elsewhere, and the list is written the other way round.
        Directory.Move(temp.Combine("b"), temp.Combine("moved"));
        var second = Sync(temp, Config(temp, ("south", "moved/docs"), ("north", "a/docs")));

        AssertNothingHappened(second, documents: 4);
    }

    [Fact]
    public void A_configuration_without_names_reads_an_index_built_with_derived_names_the_same()
    {
        using var temp = new TempDirectory();
        WriteTwoRoots(temp);

        // Built before names could be given: two folders called docs were named docs and docs-2 by order.
        var built = CliRunner.Run(temp.Path, "sync", "--index", "idx", "--root", "a/docs", "--root", "b/docs", "--json");
        Assert.Equal(0, built.ExitCode);

        var unnamed = Sync(temp, Config(temp, (null, "a/docs"), (null, "b/docs")));
        AssertNothingHappened(unnamed, documents: 4);

        // The migration: write the derived names down once; from then on order and paths are free.
        Directory.Move(temp.Combine("a"), temp.Combine("moved"));
        var named = Sync(temp, Config(temp, ("docs-2", "b/docs"), ("docs", "moved/docs")));
        AssertNothingHappened(named, documents: 4);
    }

    [Fact]
    public void A_renamed_root_finds_its_files_as_copies_and_keeps_the_old_names_documents()
    {
        using var temp = new TempDirectory();
        WriteTwoRoots(temp);
        Sync(temp, Config(temp, ("north", "a/docs"), ("south", "b/docs")));

        var renamed = Sync(temp, Config(temp, ("north", "a/docs"), ("southern", "b/docs")));

        // As docs/cli.md, "Root names", says: the new name's documents are new, their pages reused; the
        // old name is walked no more, so nothing of it is deleted on a guess.
        Assert.Equal(2, renamed.GetProperty("documentsNew").GetInt32());
        Assert.Equal(0, renamed.GetProperty("pagesNew").GetInt32());
        Assert.Equal(0, renamed.GetProperty("pagesEmbedded").GetInt32());
        Assert.Equal(0, renamed.GetProperty("documentsDeleted").GetInt32());
        var status = CliRunner.Run(temp.Path, "status", "--index", "idx", "--json");
        using var json = JsonDocument.Parse(status.Stdout);
        Assert.Equal(6, json.RootElement.GetProperty("documents").GetInt32());
    }

    [Fact]
    public void Forget_root_removes_an_old_names_documents_only_with_yes_and_keeps_pages_other_roots_hold()
    {
        using var temp = new TempDirectory();
        WriteTwoRoots(temp);
        Sync(temp, Config(temp, ("north", "a/docs"), ("south", "b/docs")));
        var renamed = Config(temp, ("north", "a/docs"), ("southern", "b/docs"));
        Sync(temp, renamed);

        // The pipes file leaves the share: the walked name drops it, the old name still holds its page.
        File.Delete(temp.Combine("b/docs/pipes.txt"));
        Assert.Equal(1, Sync(temp, renamed).GetProperty("documentsDeleted").GetInt32());
        Assert.Equal((5, 4), Counts(temp));

        // Without --yes: what it would do, read-only.
        var preview = ForgetRoot(temp, "south");
        Assert.Equal(0, preview.ExitCode);
        using (var json = JsonDocument.Parse(preview.Stdout))
        {
            Assert.False(json.RootElement.GetProperty("forgotten").GetBoolean());
            Assert.Equal(2, json.RootElement.GetProperty("documents").GetInt32());
            Assert.Equal(1, json.RootElement.GetProperty("pagesRemoved").GetInt32());
            Assert.Equal(1, json.RootElement.GetProperty("pagesKept").GetInt32());
        }

        Assert.Equal((5, 4), Counts(temp));

        var done = ForgetRoot(temp, "south", "--yes");
        Assert.True(done.ExitCode == 0, done.Stderr);
        using (var json = JsonDocument.Parse(done.Stdout))
        {
            Assert.True(json.RootElement.GetProperty("forgotten").GetBoolean());
            Assert.Equal(2, json.RootElement.GetProperty("documents").GetInt32());
            Assert.Equal(1, json.RootElement.GetProperty("pagesRemoved").GetInt32());
        }

        Assert.Equal((3, 3), Counts(temp));

        // The shared page kept its vectors: the next pass embeds nothing and changes nothing.
        AssertNothingHappened(Sync(temp, renamed), documents: 3);
    }

    [Fact]
    public void Forget_root_refuses_a_configured_name_and_a_name_the_index_does_not_know()
    {
        using var temp = new TempDirectory();
        WriteTwoRoots(temp);
        var config = Config(temp, ("north", "a/docs"), ("south", "b/docs"));
        Sync(temp, config);

        var configured = CliRunner.Run(temp.Path, "forget-root", "south", "--config", config, "--yes");
        Assert.Equal(2, configured.ExitCode);
        Assert.Contains("'south' is a root the settings give", configured.Stderr, StringComparison.Ordinal);

        var unknown = ForgetRoot(temp, "west", "--yes");
        Assert.Equal(2, unknown.ExitCode);
        Assert.Contains("no documents under the root name 'west'; it has 'north' (2 document(s)), 'south' (2 document(s))", unknown.Stderr, StringComparison.Ordinal);

        Assert.Equal((4, 4), Counts(temp));
    }

    [Theory]
    [InlineData("north=/srv/a", "north", "/srv/a")]
    [InlineData("/srv/a=b", null, "/srv/a=b")]
    [InlineData("./a=b", null, "./a=b")]
    [InlineData("north=", null, "north=")]
    [InlineData("no rth=/srv", null, "no rth=/srv")]
    public void A_root_option_carries_a_name_only_before_an_equals_sign_in_the_allowed_characters(string value, string? name, string path)
    {
        Assert.Equal((name, path), RootNaming.Split(value));
    }

    [Fact]
    public void A_derived_name_that_meets_a_given_one_is_named_as_derived()
    {
        using var temp = new TempDirectory();
        var config = Config(temp, ("docs-2", "a/notes"), (null, "b/docs"), (null, "c/docs"));

        var error = Assert.Throws<ConfigurationException>(() => OptionsLoader.Load(new ConfigurationSources(config, null, [], [])));

        Assert.Contains("Roots:2:Name: 'docs-2' (derived from its Path, as none was given) is used by two roots", Assert.Single(error.Problems), StringComparison.Ordinal);
    }

    [Fact]
    public void Names_given_with_the_root_option_are_the_roots_names()
    {
        static IEnumerable<string> Names(params string[] roots) => OptionsLoader.Load(new ConfigurationSources(null, "idx", roots, [])).Roots.Select(r => r.Name);

        Assert.Equal(["south", "docs"], Names("south=b/sales", "a/docs"));

        // A root left unnamed keeps its derived name when an earlier one is given its own: places count
        // whether named or not, as they did when every root was derived.
        Assert.Equal(["docs", "docs-2"], Names("docs=a/docs", "b/docs"));
    }

    private static void WriteTwoRoots(TempDirectory temp)
    {
        temp.Write("a/docs/pumps.txt", "Pump station four: bearings replaced, vibration within limits.");
        temp.Write("a/docs/valves.txt", "Valve chamber survey of the eastern district.");
        temp.Write("b/docs/meters.txt", "Meter reading schedule for the harbour quarter.");
        temp.Write("b/docs/pipes.txt", "Main pipe renewal along the old canal road.");
    }

    private static string Config(TempDirectory temp, params (string? Name, string Path)[] roots)
    {
        var list = roots.Select(r => r.Name is null ? new Dictionary<string, string> { ["Path"] = temp.Combine(r.Path) } : new Dictionary<string, string> { ["Name"] = r.Name, ["Path"] = temp.Combine(r.Path) });
        var file = temp.Combine("ik-" + Guid.NewGuid().ToString("N")[..8] + ".json");
        File.WriteAllText(file, JsonSerializer.Serialize(new { IndexDirectory = temp.Combine("idx"), Roots = list }));
        return file;
    }

    private static JsonElement Sync(TempDirectory temp, string config)
    {
        var result = CliRunner.Run(temp.Path, "sync", "--config", config, "--json");
        Assert.True(result.ExitCode == 0, result.Stderr);
        using var json = JsonDocument.Parse(result.Stdout);
        return json.RootElement.Clone();
    }

    private static CliRunner.Result ForgetRoot(TempDirectory temp, string name, params string[] more) =>
        CliRunner.Run(temp.Path, ["forget-root", name, "--index", "idx", "--json", .. more]);

    /// <summary>Documents and distinct page keys, as <c>status</c> counts them.</summary>
    private static (int Documents, int Pages) Counts(TempDirectory temp)
    {
        var status = CliRunner.Run(temp.Path, "status", "--index", "idx", "--json");
        using var json = JsonDocument.Parse(status.Stdout);
        return (json.RootElement.GetProperty("documents").GetInt32(), json.RootElement.GetProperty("pages").GetInt32());
    }

    private static void AssertNothingHappened(JsonElement summary, int documents)
    {
        Assert.Equal(documents, summary.GetProperty("documentsUnchanged").GetInt32());
        foreach (var field in new[] { "documentsNew", "documentsChanged", "documentsDeleted", "documentsMoved", "documentsCopied", "pagesNew", "pagesRemoved", "pagesEmbedded" })
        {
            Assert.True(summary.GetProperty(field).GetInt32() == 0, $"{field}: {summary.GetProperty(field)}");
        }
    }
}
