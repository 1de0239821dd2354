using System.Reflection;
using System.Text.RegularExpressions;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Tests.Support;
using NetArchTest.Rules;

namespace IndexKeeper.Tests.Architecture;

/// <summary>
/// The dependency direction of DEVELOPERS.md ("Dependencies"), read from the built assemblies (IL included,
/// through NetArchTest and Mono.Cecil): a folder of Core may use only the folders its row allows, and the
/// projects point one way, Cli → Service → Core.
/// </summary>
public sealed class LayeringTests
{
    private const string Core = "IndexKeeper.Core.";

    /// <summary>Which Core folders (namespaces, with their sub-namespaces) each folder may use. DEVELOPERS.md holds the same table (checked below).</summary>
    internal static readonly IReadOnlyDictionary<string, string[]> Allowed = new Dictionary<string, string[]>(StringComparer.Ordinal)
    {
        // Leaves: they know nothing of the catalog.
        ["Detect"] = [],
        ["Documents"] = ["Detect"], // files are opened by the walker's names (Detect.FileOpener)
        ["Queue"] = [],
        ["Telemetry"] = [],
        ["Health"] = [],
        ["Faults"] = [], // named fault points, armed only by tests
        ["Drift"] = [],
        ["Encoding"] = ["Documents"],
        ["Diff"] = ["Documents"],
        ["Storage"] = ["Documents", "Encoding", "Faults"],
        ["Compaction"] = ["Storage"],
        ["Search"] = ["Documents", "Encoding", "Storage"],
        ["Scheduling"] = ["Queue"],
        ["Planning"] = ["Queue", "Scheduling"],

        // The catalog knows records and the leaf values they carry.
        ["Catalog"] = ["Detect", "Documents", "Encoding", "Queue", "Faults", "Storage"], // Detect: which names are of a readable type; Storage: the directory fsync of a new catalog

        // The composing layer.
        ["Index"] = ["Catalog", "Compaction", "Documents", "Encoding", "Faults", "Queue", "Storage", "Telemetry"],
        ["Pipeline"] = ["Catalog", "Detect", "Diff", "Documents", "Drift", "Encoding", "Index", "Queue", "Storage", "Telemetry"],
    };

    [Fact]
    public void Core_folders_use_only_the_folders_their_row_allows()
    {
        var violations = Violations(typeof(IndexCatalog).Assembly, Core, Allowed);
        Assert.True(violations.Count == 0, "Back edges in Core (fix the code, or the table here and in DEVELOPERS.md):\n" + string.Join("\n", violations));
    }

    [Fact]
    public void Every_core_folder_has_a_row()
    {
        var folders = typeof(IndexCatalog).Assembly.GetTypes()
            .Select(t => t.Namespace)
            .OfType<string>()
            .Where(n => n.StartsWith(Core, StringComparison.Ordinal))
            .Select(n => n[Core.Length..].Split('.')[0])
            .ToHashSet(StringComparer.Ordinal);
        Assert.Empty(folders.Except(Allowed.Keys));
    }

    [Fact]
    public void The_table_is_the_one_in_DEVELOPERS_md()
    {
        var documented = DocumentedTable(File.ReadAllText(Path.Combine(RepositoryRoot.Path, "DEVELOPERS.md")));
        Assert.Equal(Allowed.Keys.Order(StringComparer.Ordinal), documented.Keys.Order(StringComparer.Ordinal));
        foreach (var (folder, uses) in Allowed)
        {
            Assert.True(uses.ToHashSet(StringComparer.Ordinal).SetEquals(documented[folder]), $"{folder}: DEVELOPERS.md allows {string.Join(", ", documented[folder])}, the test {string.Join(", ", uses)}");
        }
    }

    [Fact]
    public void The_checker_reports_a_back_edge()
    {
        // The same assembly against a table without the edge Pipeline → Index: ScanPass's neighbours use the
        // segment store, so the checker must name them. A checker that finds nothing would pass any table.
        var strict = Allowed.ToDictionary(p => p.Key, p => p.Key == "Pipeline" ? p.Value.Where(v => v != "Index").ToArray() : p.Value, StringComparer.Ordinal);
        var violations = Violations(typeof(IndexCatalog).Assembly, Core, strict);
        Assert.Contains(violations, v => v.StartsWith("Pipeline → Index:", StringComparison.Ordinal) && v.Contains("EmbedPass", StringComparison.Ordinal));
    }

    [Fact]
    public void The_checker_sees_a_back_edge_made_only_in_a_method_body()
    {
        // Fixture/: Leaf may use nothing, Hub may use Leaf; LeafTally calls the hub inside a method body only.
        // The allowed edge (Hub → Leaf) is not reported, the back edge is, and nothing else.
        var table = new Dictionary<string, string[]>(StringComparer.Ordinal) { ["Leaf"] = [], ["Hub"] = ["Leaf"] };
        var violations = Violations(typeof(LayeringTests).Assembly, typeof(LayeringTests).Namespace + ".Fixture.", table);
        Assert.Equal(["Leaf → Hub: LeafTally"], violations);
    }

    [Fact]
    public void Projects_point_one_way()
    {
        // Cli → Service → Core; the demo generator stands alone.
        Assert.Empty(ProjectReferences(typeof(IndexCatalog).Assembly));
        Assert.Equal(["IndexKeeper.Core"], ProjectReferences(typeof(IndexKeeper.Service.Configuration.IndexKeeperOptions).Assembly));
        Assert.Empty(ProjectReferences(typeof(IndexKeeper.Demo.DemoStore).Assembly));
        Assert.DoesNotContain("indexkeeper", ProjectReferences(typeof(IndexKeeper.Service.Configuration.IndexKeeperOptions).Assembly));
    }

    /// <summary>Every edge between the folders under <paramref name="root"/> that <paramref name="allowed"/> does not list, with the types that make it.</summary>
    internal static List<string> Violations(Assembly assembly, string root, IReadOnlyDictionary<string, string[]> allowed)
    {
        var violations = new List<string>();
        foreach (var (folder, uses) in allowed)
        {
            foreach (var other in allowed.Keys.Where(o => o != folder && !uses.Contains(o)))
            {
                var result = Types.InAssembly(assembly)
                    .That().ResideInNamespace(root + folder)
                    .ShouldNot().HaveDependencyOnAny(root + other)
                    .GetResult();
                if (!result.IsSuccessful)
                {
                    violations.Add($"{folder} → {other}: " + string.Join(", ", result.FailingTypes.Select(t => t.Name).Order(StringComparer.Ordinal)));
                }
            }
        }

        return violations;
    }

    /// <summary>The table under DEVELOPERS.md's "Dependencies inside Core": folders of a row → what they may use (notes in brackets dropped).</summary>
    private static Dictionary<string, HashSet<string>> DocumentedTable(string markdown)
    {
        var section = markdown[markdown.IndexOf("## Dependencies inside Core", StringComparison.Ordinal)..];
        section = section[..section.IndexOf("\n## ", 1, StringComparison.Ordinal)];
        var table = new Dictionary<string, HashSet<string>>(StringComparer.Ordinal);
        foreach (var line in section.Split('\n').Where(l => l.StartsWith("| ", StringComparison.Ordinal)).Skip(1))
        {
            var cells = line.Split('|', StringSplitOptions.TrimEntries);
            var uses = Names(Regex.Replace(cells[2], @"\([^)]*\)", string.Empty)).Where(n => n != "—").ToHashSet(StringComparer.Ordinal);
            foreach (var folder in Names(cells[1]))
            {
                table.Add(folder, uses);
            }
        }

        return table;

        static IEnumerable<string> Names(string cell) => cell.Split(',', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries);
    }

    private static List<string> ProjectReferences(Assembly assembly) =>
        assembly.GetReferencedAssemblies()
            .Select(a => a.Name!)
            .Where(n => n.StartsWith("IndexKeeper", StringComparison.Ordinal) || n == "indexkeeper")
            .Order(StringComparer.Ordinal)
            .ToList();
}
