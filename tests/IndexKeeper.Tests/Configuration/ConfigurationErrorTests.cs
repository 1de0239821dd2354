using IndexKeeper.Service.Configuration;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Configuration;

/// <summary>
/// Bad settings are all reported at once, each naming the setting and where it came from; a settings file
/// that cannot be read is named with line and column; an unknown key is named with the nearest known one.
/// </summary>
public sealed class ConfigurationErrorTests
{
    [Fact]
    public void Every_bad_setting_of_every_source_is_reported_in_one_run()
    {
        using var temp = new TempDirectory();
        var config = temp.Write("ik.json", """
            { "IndexDirectory": "idx", "Limits": { "MaxPagez": 3, "MaxFileMegabytes": "big" }, "Roots": [ { "Name": "a", "Path": "docs", "Incude": [ "*.pdf" ] } ] }
            """);
        var result = CliRunner.Run(
            temp.Path,
            new Dictionary<string, string> { ["INDEXKEEPER_Storage__SealAtMegabyte"] = "4" },
            shippedEncoder: false,
            "status", "--config", config, "--Detect:SettleSecnds=1", "--Encoder:Dimensions=65", "--Limits:ReadTimeoutSeconds=-1");
        var stderr = result.Stderr;

        Assert.Equal(2, result.ExitCode);
        Assert.Equal(string.Empty, result.Stdout);
        Assert.Contains($"Limits:MaxPagez: no such setting (in {config}); did you mean Limits:MaxPages?", stderr, StringComparison.Ordinal);
        Assert.Contains("Roots:0:Incude: no such setting", stderr, StringComparison.Ordinal);
        Assert.Contains("did you mean Roots:0:Include?", stderr, StringComparison.Ordinal);
        Assert.Contains("Limits:MaxFileMegabytes: 'big' is not a whole number", stderr, StringComparison.Ordinal);
        Assert.Contains("Detect:SettleSecnds: no such setting (command line); did you mean Detect:SettleSeconds?", stderr, StringComparison.Ordinal);
        Assert.Contains("Storage:SealAtMegabyte: no such setting (environment INDEXKEEPER_Storage__SealAtMegabyte); did you mean Storage:SealAtMegabytes?", stderr, StringComparison.Ordinal);

        // Range rules of the options validation run on the rest in the same pass.
        Assert.Contains("Encoder:Dimensions: 65 is not allowed", stderr, StringComparison.Ordinal);
        Assert.Contains("Limits:ReadTimeoutSeconds: -1 is out of range", stderr, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", stderr, StringComparison.Ordinal);
    }

    [Fact]
    public void Malformed_json_is_named_with_file_line_and_column()
    {
        using var temp = new TempDirectory();

        // Line 3 holds a non-ASCII name before the fault: the column counts characters, as editors do
        // (common practice), not the bytes of its UTF-8 form.
        var config = temp.Write("ik.json", "{\n  // the index\n  \"IndexDirectory\": \"Zürich\" \"Roots\": []\n}\n");

        var error = Assert.Throws<ConfigurationException>(() => OptionsLoader.Load(new ConfigurationSources(config, null, [], []), rootsRequired: false));

        var problem = Assert.Single(error.Problems);
        Assert.StartsWith($"{config}:3:30: ", problem, StringComparison.Ordinal);
    }

    [Fact]
    public void A_key_given_twice_is_named_with_its_second_place()
    {
        using var temp = new TempDirectory();
        var config = temp.Write("ik.json", "{\n  \"Limits\": {\n    \"MaxPages\": 10,\n    \"maxPages\": 20\n  }\n}\n");

        var error = Assert.Throws<ConfigurationException>(() => OptionsLoader.Load(new ConfigurationSources(config, "idx", [], []), rootsRequired: false));

        Assert.Equal($"{config}:4:5: the key \"maxPages\" is given twice in one object; keep one.", Assert.Single(error.Problems));
    }

    [Fact]
    public void The_sample_configuration_loads_without_a_problem()
    {
        var sample = Path.Combine(RepositoryRoot.Path, "config", "indexkeeper.sample.json");

        var options = OptionsLoader.Load(new ConfigurationSources(sample, null, [], []));

        Assert.Equal("shared-drive", Assert.Single(options.Roots).Name);
        Assert.Equal("minilm", options.Encoder.Name);
    }
}
