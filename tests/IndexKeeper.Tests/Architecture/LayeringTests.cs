using System.Reflection;
using IndexKeeper.Core.Catalog;
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

    /// <summary>Which Core folders (namespaces, with their sub-namespaces) each folder may use. Keep in step with DEVELOPERS.md.</summary>
    internal static readonly IReadOnlyDictionary<string, string[]> Allowed = new Dictionary<string, string[]>(StringComparer.Ordinal)
    {
        // Leaves: they know nothing of the catalog.
        ["Detect"] = [],
        ["Documents"] = ["Detect"], // files are opened by the walker's names (Detect.FileOpener)
        ["Queue"] = [],
        ["Telemetry"] = [],
        ["Health"] = [],
        ["Drift"] = [],
        ["Encoding"] = ["Documents"],
        ["Diff"] = ["Documents"],
        ["Storage"] = ["Documents", "Encoding"],
        ["Compaction"] = ["Storage"],
        ["Search"] = ["Documents", "Encoding", "Storage"],
        ["Scheduling"] = ["Queue"],
        ["Planning"] = ["Queue", "Scheduling"],

        // The catalog knows records and the leaf values they carry.
        ["Catalog"] = ["Documents", "Encoding", "Queue", "Drift", "Compaction"],

        // The composing layer.
        ["Index"] = ["Catalog", "Compaction", "Documents", "Encoding", "Queue", "Storage", "Telemetry"],
        ["Pipeline"] = ["Catalog", "Detect", "Diff", "Documents", "Drift", "Encoding", "Index", "Queue", "Storage", "Telemetry"],
    };

    [Fact]
    public void Core_folders_use_only_the_folders_their_row_allows()
    {
        var violations = Violations(typeof(IndexCatalog).Assembly, Allowed);
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
    public void The_checker_reports_a_back_edge()
    {
        // The same assembly against a table without the edge Pipeline → Index: ScanPass's neighbours use the
        // segment store, so the checker must name them. A checker that finds nothing would pass any table.
        var strict = Allowed.ToDictionary(p => p.Key, p => p.Key == "Pipeline" ? p.Value.Where(v => v != "Index").ToArray() : p.Value, StringComparer.Ordinal);
        var violations = Violations(typeof(IndexCatalog).Assembly, strict);
        Assert.Contains(violations, v => v.StartsWith("Pipeline → Index:", StringComparison.Ordinal) && v.Contains("EmbedPass", StringComparison.Ordinal));
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

    internal static List<string> Violations(Assembly assembly, IReadOnlyDictionary<string, string[]> allowed)
    {
        var violations = new List<string>();
        foreach (var (folder, uses) in allowed)
        {
            foreach (var other in allowed.Keys.Where(o => o != folder && !uses.Contains(o)))
            {
                var result = Types.InAssembly(assembly)
                    .That().ResideInNamespace(Core + folder)
                    .ShouldNot().HaveDependencyOnAny(Core + other)
                    .GetResult();
                if (!result.IsSuccessful)
                {
                    violations.Add($"{folder} → {other}: " + string.Join(", ", result.FailingTypes.Select(t => t.Name).Order(StringComparer.Ordinal)));
                }
            }
        }

        return violations;
    }

    private static List<string> ProjectReferences(Assembly assembly) =>
        assembly.GetReferencedAssemblies()
            .Select(a => a.Name!)
            .Where(n => n.StartsWith("IndexKeeper", StringComparison.Ordinal) || n == "indexkeeper")
            .Order(StringComparer.Ordinal)
            .ToList();
}
