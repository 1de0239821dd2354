using System.Reflection;
using System.Text.RegularExpressions;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Service.Application;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Docs;

/// <summary>
/// docs/architecture.md names the types a page key passes through and the class of each use case; every
/// type in its "Types" table must exist in the built assemblies, so a rename cannot leave the document behind.
/// </summary>
public sealed partial class ArchitectureTypesTests
{
    [Fact]
    public void Every_type_the_types_table_lists_exists()
    {
        var names = TableTypes(File.ReadAllText(Path.Combine(RepositoryRoot.Path, "docs", "architecture.md")));
        Assert.True(names.Count >= 30, $"the Types table lists only {names.Count} types; the parser may have lost it");
        var known = KnownTypeNames();
        var missing = names.Where(n => !known.Contains(n)).ToList();
        Assert.True(missing.Count == 0, "docs/architecture.md lists types that do not exist: " + string.Join(", ", missing));
    }

    [Fact]
    public void The_checker_reports_a_missing_type()
    {
        // A made-up name in a table of the same shape is reported; a checker that finds nothing would pass any document.
        var names = TableTypes("# A document\n\n## Types\n\n| type | layer | role |\n|---|---|---|\n| `ScanOperation` | Service | scan |\n| `NoSuchOperation` | Service | none |\n\n## Next\n\n| `OpenIndex` | x | y |\n");
        Assert.Equal(["ScanOperation", "NoSuchOperation"], names);
        Assert.DoesNotContain("NoSuchOperation", KnownTypeNames());
    }

    /// <summary>The first cell of each row of the table under "## Types", up to the next heading.</summary>
    private static List<string> TableTypes(string markdown)
    {
        var start = markdown.IndexOf("\n## Types", StringComparison.Ordinal);
        Assert.True(start >= 0, "docs/architecture.md has no \"## Types\" section");
        var section = markdown[(start + 1)..];
        var next = section.IndexOf("\n## ", 1, StringComparison.Ordinal);
        section = next < 0 ? section : section[..next];
        return TableRow().Matches(section).Select(m => m.Groups["type"].Value).ToList();
    }

    /// <summary>Simple names (generic arity dropped) of every type in Core, Service and the command.</summary>
    private static HashSet<string> KnownTypeNames() =>
        new[] { typeof(IndexCatalog).Assembly, typeof(OpenIndex).Assembly, Assembly.Load("indexkeeper") }
            .SelectMany(a => a.GetTypes())
            .Select(t => t.Name.Split('`')[0])
            .ToHashSet(StringComparer.Ordinal);

    [GeneratedRegex(@"^\|\s*`(?<type>[A-Za-z_][A-Za-z0-9_]*)`\s*\|", RegexOptions.Multiline)]
    private static partial Regex TableRow();
}
