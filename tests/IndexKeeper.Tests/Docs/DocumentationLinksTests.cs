using System.Text.RegularExpressions;

using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Docs;

/// <summary>
/// Every document and file the documentation and the code point to exists: markdown links, repository
/// paths written in backticks, and the documents that code comments cite.
/// </summary>
public sealed partial class DocumentationLinksTests
{
    // Documents of other projects that comments cite by their own path; not files of this repository.
    private static readonly IReadOnlySet<string> ExternalDocuments = new HashSet<string>(StringComparer.Ordinal)
    {
        "docs/Versioning.md", // the ONNX repository's versioning document (Encoding/PageImages/OnnxModels.cs)
    };

    [Fact]
    public void Markdown_links_and_repository_paths_resolve()
    {
        var root = RepositoryRoot.Path;
        var missing = new List<string>();
        foreach (var document in Documents(root))
        {
            var text = File.ReadAllText(document);
            var relative = Path.GetRelativePath(root, document);
            foreach (Match link in MarkdownLink().Matches(text))
            {
                var target = link.Groups["target"].Value.Split('#')[0];
                if (target.Length == 0 || target.Contains("://", StringComparison.Ordinal) || target.StartsWith("mailto:", StringComparison.Ordinal))
                {
                    continue;
                }

                if (!Exists(Path.Combine(Path.GetDirectoryName(document)!, target)))
                {
                    missing.Add($"{relative}: link ({target})");
                }
            }

            foreach (Match path in BacktickedPath().Matches(text))
            {
                var target = path.Groups["path"].Value.TrimEnd('.', ',', ';', ':', ')');
                if (!IsPattern(target) && !Exists(Path.Combine(root, target)))
                {
                    missing.Add($"{relative}: `{target}`");
                }
            }
        }

        Assert.True(missing.Count == 0, "Documentation points to files that do not exist:\n" + string.Join("\n", missing));
    }

    [Fact]
    public void Documents_cited_in_code_exist()
    {
        var root = RepositoryRoot.Path;
        var missing = new List<string>();
        foreach (var folder in new[] { "src", "tests" })
        {
            foreach (var file in Directory.EnumerateFiles(Path.Combine(root, folder), "*.cs", SearchOption.AllDirectories))
            {
                if (IsBuildOutput(root, file) || Path.GetFileName(file) == nameof(DocumentationLinksTests) + ".cs")
                {
                    continue;
                }

                foreach (Match cited in CitedDocument().Matches(File.ReadAllText(file)))
                {
                    var name = cited.Groups["doc"].Value;
                    if (ExternalDocuments.Contains(name))
                    {
                        continue;
                    }

                    var found = name.Contains('/', StringComparison.Ordinal)
                        ? File.Exists(Path.Combine(root, name))
                        : File.Exists(Path.Combine(root, name)) || File.Exists(Path.Combine(root, "docs", name));
                    if (!found)
                    {
                        missing.Add($"{Path.GetRelativePath(root, file)}: {name}");
                    }
                }
            }
        }

        Assert.True(missing.Count == 0, "Code cites documents that do not exist:\n" + string.Join("\n", missing));
    }

    [Fact]
    public void The_checker_finds_a_broken_link()
    {
        // The patterns must match what a broken reference looks like, or the two tests above pass on anything.
        Assert.Matches(MarkdownLink(), "see [the format](docs/no-such-file.md) for details");
        Assert.Equal("docs/no-such-file.md", BacktickedPath().Match("see `docs/no-such-file.md`.").Groups["path"].Value.TrimEnd('.'));
        Assert.Equal("NO-SUCH-BRIEF.md", CitedDocument().Match("/// the contract (NO-SUCH-BRIEF.md)").Groups["doc"].Value);
        Assert.False(Exists(Path.Combine(RepositoryRoot.Path, "docs/no-such-file.md")));
    }

    private static IEnumerable<string> Documents(string root) =>
        new[] { Path.Combine(root, "README.md"), Path.Combine(root, "DEVELOPERS.md") }
            .Concat(Directory.EnumerateFiles(Path.Combine(root, "docs"), "*.md", SearchOption.AllDirectories));

    private static bool Exists(string path) => File.Exists(path) || Directory.Exists(path);

    /// <summary>Globs, placeholders and elisions name a family of files, not one.</summary>
    private static bool IsPattern(string path) => path.IndexOfAny(['*', '{', '<', '…', '[']) >= 0 || path.Contains("...", StringComparison.Ordinal);

    private static bool IsBuildOutput(string root, string file)
    {
        var parts = Path.GetRelativePath(root, file).Split(Path.DirectorySeparatorChar);
        return parts.Contains("bin") || parts.Contains("obj");
    }

    [GeneratedRegex(@"\]\((?<target>[^)\s]+)\)")]
    private static partial Regex MarkdownLink();

    [GeneratedRegex(@"`(?<path>(?:docs|src|tests|config)/[^`\s]+)")]
    private static partial Regex BacktickedPath();

    [GeneratedRegex(@"(?<![\w/.-])(?<doc>(?:docs/)?[A-Za-z][\w-]*\.md)\b")]
    private static partial Regex CitedDocument();
}
