using System.CommandLine;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Cli.CommandLine;

/// <summary>The options every command takes (docs/cli.md, "Synopsis"); declared once on the root and inherited.</summary>
internal static class CommonOptions
{
    public static readonly Option<string?> Index = LastValue.Wins(new("--index")
    {
        Description = "the index directory (catalog, segments, lock); the setting IndexDirectory",
        HelpName = "DIR",
        Recursive = true,
    });

    public static readonly Option<string[]> Roots = new("--root")
    {
        Description = "a folder to keep indexed, as NAME=DIR (the root's stable name) or DIR (named after its folder); repeat for more; replaces the roots of --config",
        HelpName = "[NAME=]DIR",
        Recursive = true,
    };

    public static readonly Option<string?> Config = LastValue.Wins(new("--config")
    {
        Description = "a JSON settings file (config/indexkeeper.sample.json explains each setting)",
        HelpName = "FILE",
        Recursive = true,
    });

    public static readonly Option<string?> Encoder = CreateEncoder();

    public static readonly Option<bool> Json = new("--json")
    {
        Description = "print exactly one JSON object on stdout; logs and progress go to stderr",
        Recursive = true,
    };

    public static IEnumerable<Option> All => [Index, Roots, Config, Encoder, Json];

    private static Option<string?> CreateEncoder()
    {
        var option = LastValue.Wins(new Option<string?>("--encoder")
        {
            Description = "the encoder to use: " + string.Join(", ", IndexKeeperOptionsValidator.EncoderNames) +
                "; unset, an existing index keeps its own, a new one gets minilm; naming another starts a migration",
            HelpName = "NAME",
            Recursive = true,
        });
        option.CompletionSources.Add([.. IndexKeeperOptionsValidator.EncoderNames]);
        return option;
    }
}
