using IndexKeeper.Core.Detect;
using Microsoft.Extensions.FileSystemGlobbing;

namespace IndexKeeper.Tests.Detect;

public sealed class RootWalkerTests
{
    /// <summary>The Linux walker and the portable one (used on Windows and macOS) run the same checks here.</summary>
    public static TheoryData<string> Walkers => new() { "linux", "managed" };

    private static IRootWalker WalkerFor(string name) =>
        name == "linux" ? RootWalker.Create() : new TreeWalker(new ManagedFolderSystem());

    private static RootSpec Spec(string path, string[]? include = null, string[]? exclude = null) =>
        new("docs", path, include ?? [], exclude ?? []);

    private static (List<FoundFile> Files, List<WalkProblem> Problems) Walk(IRootWalker walker, RootSpec spec)
    {
        var problems = new List<WalkProblem>();
        var files = walker.Walk(spec, problems.Add).ToList();
        return (files, problems);
    }

    [LinuxTheory]
    [MemberData(nameof(Walkers))]
    public void A_root_without_include_globs_takes_readable_types_in_any_case_and_counts_what_it_passes_over(string walker)
    {
        using var tree = new TempTree();
        foreach (var name in new[] { "SCAN0001.PDF", "minutes.Docx", "notes.txt", "drawings.dwg", "archive.zip", "Makefile", "tmp/draft.pdf" })
        {
            tree.Write(name, System.Text.Encoding.UTF8.GetBytes(name));
        }

        var passedOver = new List<PassedOverFile>();
        var files = WalkerFor(walker).Walk(Spec(tree.Root, exclude: ["tmp/*.pdf"]), _ => { }, passedOver.Add).Select(f => f.RelativePath).ToList();

        // A scanner on a Windows share writes upper-case extensions: the default selection ignores letter case.
        Assert.Equal(["SCAN0001.PDF", "minutes.Docx", "notes.txt"], files);
        Assert.Equal(
            [("Makefile", false), ("archive.zip", false), ("drawings.dwg", false), ("tmp/draft.pdf", true)],
            passedOver.Select(p => (p.RelativePath, p.ReadableType)).Order());
        Assert.Equal(["(none)", ".dwg", ".zip"], passedOver.Where(p => !p.ReadableType).Select(p => ReadableTypes.TypeOf(p.RelativePath)).Order(StringComparer.Ordinal));
    }

    [LinuxTheory]
    [MemberData(nameof(Walkers))]
    public void Walks_depth_first_in_ordinal_order_and_reproducibly(string walker)
    {
        using var tree = new TempTree();
        foreach (var name in new[] { "b.pdf", "a/z.pdf", "B.pdf", "a.pdf", "a/b/c.pdf", "aa.pdf", "empty.pdf" })
        {
            tree.Write(name, name == "empty.pdf" ? [] : System.Text.Encoding.UTF8.GetBytes(name));
        }

        var (first, problems) = Walk(WalkerFor(walker), Spec(tree.Root));
        var (second, _) = Walk(WalkerFor(walker), Spec(tree.Root));

        // Ordinal: 'B' (0x42) sorts before 'a' (0x61); "a" before "a.pdf"; folders are entered where they sort.
        Assert.Equal(["B.pdf", "a/b/c.pdf", "a/z.pdf", "a.pdf", "aa.pdf", "b.pdf", "empty.pdf"], first.Select(f => f.RelativePath));
        Assert.Equal(first.Select(f => f.RelativePath), second.Select(f => f.RelativePath));
        Assert.Empty(problems);
        Assert.Equal(0, first.Single(f => f.RelativePath == "empty.pdf").Stat.Size);
        Assert.All(first, f => Assert.Equal("docs", f.Root));
        Assert.All(first, f => Assert.Equal(FileStatReader.Read(f.FullPath).Stat, f.Stat));
    }

    [LinuxTheory]
    [MemberData(nameof(Walkers))]
    public void Selects_the_same_files_as_the_globbing_library(string walker)
    {
        using var tree = new TempTree();
        foreach (var name in new[]
        {
            "a.pdf", "notes.txt", "scans/p1.png", "scans/deep/p2.png", "drafts/x.pdf", "drafts/sub/y.pdf",
            "site/tmp/z.pdf", "site/keep.pdf", "archive/2019/old.pdf", "archive.pdf", "mid/drafts/q.pdf",
            "mid/r.bak.pdf", "x.pdf/inside.pdf",
        })
        {
            tree.Write(name);
        }

        string[] include = ["**/*.pdf", "scans/*.png"];
        string[] exclude = ["drafts", "**/tmp", "archive/**", "**/*.bak.pdf", "x.pdf"];
        var (files, problems) = Walk(WalkerFor(walker), Spec(tree.Root, include, exclude));

        // Reference: Microsoft.Extensions.FileSystemGlobbing's own directory walk over the same tree.
        var matcher = new Matcher(StringComparison.Ordinal);
        matcher.AddIncludePatterns(include);
        matcher.AddExcludePatterns(exclude);
        var expected = matcher.Execute(new Microsoft.Extensions.FileSystemGlobbing.Abstractions.DirectoryInfoWrapper(new DirectoryInfo(tree.Root)))
            .Files.Select(f => f.Path).Order(StringComparer.Ordinal);
        Assert.Equal(expected, files.Select(f => f.RelativePath).Order(StringComparer.Ordinal));
        Assert.Contains("mid/drafts/q.pdf", files.Select(f => f.RelativePath));
        Assert.Empty(problems);
    }

    [LinuxFact]
    public void Does_not_descend_an_excluded_folder()
    {
        using var tree = new TempTree();
        tree.Write("keep.pdf");
        tree.Write("private/secret.pdf");
        TempTree.Run("chmod", "000", tree.PathOf("private"));

        // Unprivileged, listing "private" would be reported as inaccessible; excluded, it is never opened.
        var (files, problems) = Unprivileged.Run(() => Walk(RootWalker.Create(), Spec(tree.Root, exclude: ["private"])));

        Assert.Equal(["keep.pdf"], files.Select(f => f.RelativePath));
        Assert.Empty(problems);
    }

    [LinuxTheory]
    [MemberData(nameof(Walkers))]
    public void Skips_and_reports_a_file_link_pointing_out_of_the_root(string walker)
    {
        using var tree = new TempTree();
        var outside = tree.Write("outside/secret.pdf", "not ours");
        var lookalike = tree.Write("docs-evil/secret.pdf", "prefix of the root's name");
        tree.Write("docs/inside.pdf");
        var root = tree.PathOf("docs");
        File.CreateSymbolicLink(Path.Combine(root, "absolute.pdf"), outside);
        File.CreateSymbolicLink(Path.Combine(root, "relative.pdf"), "../outside/secret.pdf");
        File.CreateSymbolicLink(Path.Combine(root, "sibling.pdf"), lookalike);

        var (files, problems) = Walk(WalkerFor(walker), Spec(root));

        Assert.Equal(["inside.pdf"], files.Select(f => f.RelativePath));
        Assert.Equal(["absolute.pdf", "relative.pdf", "sibling.pdf"], problems.Select(p => p.RelativePath));
        Assert.All(problems, p => Assert.Equal(WalkProblemKind.LinkOutsideRoot, p.Kind));
        Assert.All(problems, p => Assert.False(p.LeavesUnknown));
    }

    [LinuxTheory]
    [MemberData(nameof(Walkers))]
    public void Does_not_descend_links_to_folders(string walker)
    {
        using var tree = new TempTree();
        tree.Write("outside/o.pdf");
        tree.Write("docs/real/r.pdf");
        var root = tree.PathOf("docs");
        Directory.CreateSymbolicLink(Path.Combine(root, "out-link"), tree.PathOf("outside"));
        Directory.CreateSymbolicLink(Path.Combine(root, "in-link"), Path.Combine(root, "real"));
        Directory.CreateSymbolicLink(Path.Combine(root, "real", "loop"), root);

        var (files, problems) = Walk(WalkerFor(walker), Spec(root));

        Assert.Equal(["real/r.pdf"], files.Select(f => f.RelativePath));
        Assert.Equal(["in-link", "out-link", "real/loop"], problems.Select(p => p.RelativePath));
        Assert.All(problems, p => Assert.Equal(WalkProblemKind.LinkToFolder, p.Kind));
    }

    [LinuxTheory]
    [MemberData(nameof(Walkers))]
    public void Takes_a_link_inside_the_root_to_a_file_inside_by_its_target(string walker)
    {
        using var tree = new TempTree();
        var target = tree.Write("docs/manuals/pump.pdf", "pump manual");
        var root = tree.PathOf("docs");
        File.CreateSymbolicLink(Path.Combine(root, "latest.pdf"), "manuals/pump.pdf");
        File.CreateSymbolicLink(Path.Combine(root, "broken.pdf"), "manuals/none.pdf");

        var (files, problems) = Walk(WalkerFor(walker), Spec(root));

        Assert.Equal(["latest.pdf", "manuals/pump.pdf"], files.Select(f => f.RelativePath));
        var link = files[0];
        Assert.Equal(target, link.FullPath);
        Assert.Equal(files[1].Stat, link.Stat);
        Assert.Equal(WalkProblemKind.BrokenLink, Assert.Single(problems).Kind);
    }

    [LinuxFact]
    public void Reports_an_unreadable_folder_and_walks_on()
    {
        using var tree = new TempTree();
        tree.Write("a.pdf");
        tree.Write("locked/hidden.pdf");
        tree.Write("z.pdf");
        var unreadableFile = tree.Write("sealed.pdf", "no read permission");
        TempTree.Run("chmod", "000", tree.PathOf("locked"), unreadableFile);

        var (files, problems, hash) = Unprivileged.Run(() =>
        {
            var (found, reported) = Walk(RootWalker.Create(), Spec(tree.Root));
            return (found, reported, FileHasher.Create().Hash(found.Single(f => f.RelativePath == "sealed.pdf"), CancellationToken.None));
        });

        Assert.Equal(["a.pdf", "sealed.pdf", "z.pdf"], files.Select(f => f.RelativePath));
        var problem = Assert.Single(problems);
        Assert.Equal(("locked", WalkProblemKind.Inaccessible, true, true), (problem.RelativePath, problem.Kind, problem.CoversSubtree, problem.LeavesUnknown));
        Assert.Contains("errno 13", problem.Detail, StringComparison.Ordinal);
        // The file's stat needs no read permission, its content does: the hasher says so.
        Assert.Equal(FileHashStatus.Inaccessible, hash.Status);
    }

    [LinuxFact]
    public void Reports_entries_of_a_folder_that_can_be_listed_but_not_searched()
    {
        using var tree = new TempTree();
        tree.Write("list-only/sub/x.pdf");
        tree.Write("list-only/y.pdf");
        // r-- without x: the names can be read, the entries cannot be looked at (POSIX search permission).
        TempTree.Run("chmod", "444", tree.PathOf("list-only"));

        var (files, problems) = Unprivileged.Run(() => Walk(RootWalker.Create(), Spec(tree.Root)));

        Assert.Empty(files);
        Assert.Equal(
            [("list-only/sub", WalkProblemKind.Inaccessible, true), ("list-only/y.pdf", WalkProblemKind.Inaccessible, true)],
            problems.Select(p => (p.RelativePath, p.Kind, p.CoversSubtree)));
        Assert.All(problems, p => Assert.True(p.LeavesUnknown));
    }

    [LinuxTheory]
    [MemberData(nameof(Walkers))]
    public void Reports_entries_that_vanish_mid_walk(string walker)
    {
        using var tree = new TempTree();
        tree.Write("a.pdf");
        tree.Write("b.pdf");
        tree.Write("c/inner.pdf");
        tree.Write("d.pdf");
        var problems = new List<WalkProblem>();
        var seen = new List<string>();

        foreach (var file in WalkerFor(walker).Walk(Spec(tree.Root), problems.Add))
        {
            seen.Add(file.RelativePath);
            if (file.RelativePath == "a.pdf")
            {
                File.Delete(tree.PathOf("b.pdf"));
                Directory.Delete(tree.PathOf("c"), recursive: true);
            }
        }

        Assert.Equal(["a.pdf", "d.pdf"], seen);
        Assert.Equal([("b.pdf", WalkProblemKind.Vanished, true), ("c", WalkProblemKind.Vanished, true)], problems.Select(p => (p.RelativePath, p.Kind, p.CoversSubtree)));
    }

    [LinuxFact]
    public void Yields_a_name_that_is_not_utf8_so_that_it_can_be_opened_and_hashed()
    {
        using var tree = new TempTree();
        // Bytes 0xFF 0xFE are never valid UTF-8 (RFC 3629 §1); the shell writes the raw name.
        TempTree.Run("sh", "-c", "cd \"$1\" && printf 'inspection form' > \"$(printf 'form-\\377\\376.pdf')\"", "sh", tree.Root);

        var (files, problems) = Walk(RootWalker.Create(), Spec(tree.Root, include: ["**/*.pdf"]));

        var file = Assert.Single(files);
        Assert.Empty(problems);
        Assert.DoesNotContain('\uFFFD', file.RelativePath);
        // The name survives storage as UTF-8 (the catalog) unchanged.
        Assert.Equal(file.RelativePath, System.Text.Encoding.UTF8.GetString(System.Text.Encoding.UTF8.GetBytes(file.RelativePath)));
        var result = FileHasher.Create().Hash(file, CancellationToken.None);
        Assert.Equal(FileHashStatus.Stable, result.Status);
        // Independent tool: coreutils sha256sum over the same raw name (matched by the shell's glob).
        var reference = TempTree.Run("sh", "-c", "cd \"$1\" && sha256sum form-*.pdf", "sh", tree.Root).Split(' ')[0];
        Assert.Equal(reference, Convert.ToHexStringLower(result.Sha256!));
        using var stream = FileOpener.OpenRead(file.FullPath);
        Assert.Equal("inspection form", new StreamReader(stream).ReadToEnd());
    }

    [LinuxTheory]
    [MemberData(nameof(Walkers))]
    public void Walks_paths_longer_than_260_characters(string walker)
    {
        using var tree = new TempTree();
        var relative = string.Join('/', Enumerable.Range(0, 8).Select(i => new string((char)('a' + i), 40))) + "/deep.pdf";
        var path = tree.Write(relative, "deep");
        Assert.True(path.Length > 260);

        var (files, problems) = Walk(WalkerFor(walker), Spec(tree.Root));

        Assert.Equal(relative, Assert.Single(files).RelativePath);
        Assert.Empty(problems);
        Assert.True(FileHasher.Create().Hash(files[0], CancellationToken.None).Stable);
    }

    [LinuxFact]
    public void Reports_a_path_beyond_path_max_and_walks_on()
    {
        using var tree = new TempTree();
        tree.Write("z.pdf");
        // 20 levels of 250-byte names: about 5,000 bytes, past Linux's PATH_MAX of 4,096 (limits.h).
        // bash builds it with relative steps (cd -P calls chdir on the bare name), which no path limit stops.
        var name = new string('n', 250);
        TempTree.Run("bash", "-c", "cd \"$1\" && for i in $(seq 1 20); do mkdir \"$2\" && cd -P \"$2\" || exit 1; done && printf x > f.pdf", "bash", tree.Root, name);

        var (files, problems) = Walk(RootWalker.Create(), Spec(tree.Root));

        Assert.Equal(["z.pdf"], files.Select(f => f.RelativePath));
        var problem = Assert.Single(problems);
        Assert.Equal((WalkProblemKind.PathTooLong, true), (problem.Kind, problem.CoversSubtree));
        Assert.True(problem.LeavesUnknown);
    }

    [LinuxTheory]
    [MemberData(nameof(Walkers))]
    public void Reports_a_missing_root_distinctly(string walker)
    {
        using var tree = new TempTree();
        var file = tree.Write("not-a-folder.pdf");

        var (missingFiles, missing) = Walk(WalkerFor(walker), Spec(tree.PathOf("unmounted-share")));
        var (_, notFolder) = Walk(WalkerFor(walker), Spec(file));

        Assert.Empty(missingFiles);
        var problem = Assert.Single(missing);
        Assert.Equal((WalkProblemKind.RootMissing, string.Empty, true, true), (problem.Kind, problem.RelativePath, problem.CoversSubtree, problem.LeavesUnknown));
        Assert.Equal(WalkProblemKind.RootInaccessible, Assert.Single(notFolder).Kind);
    }

    [LinuxTheory]
    [MemberData(nameof(Walkers))]
    public void Walks_a_root_that_is_itself_a_link_by_its_real_path(string walker)
    {
        using var tree = new TempTree();
        tree.Write("real-root/a.pdf");
        var link = tree.PathOf("root-link");
        Directory.CreateSymbolicLink(link, tree.PathOf("real-root"));

        var (files, problems) = Walk(WalkerFor(walker), Spec(link));

        Assert.Equal(tree.PathOf("real-root/a.pdf"), Assert.Single(files).FullPath);
        Assert.Empty(problems);
    }

    [LinuxTheory]
    [MemberData(nameof(Walkers))]
    public void Reports_a_pipe_instead_of_reading_it(string walker)
    {
        using var tree = new TempTree();
        TempTree.Run("mkfifo", tree.PathOf("feed.pdf"));
        tree.Write("ok.pdf");

        var (files, problems) = Walk(WalkerFor(walker), Spec(tree.Root));

        Assert.Equal(["ok.pdf"], files.Select(f => f.RelativePath));
        if (walker == "linux")
        {
            Assert.Equal(WalkProblemKind.NotRegularFile, Assert.Single(problems).Kind);
        }
    }

    [LinuxFact]
    public void Stops_when_cancelled()
    {
        using var tree = new TempTree();
        tree.Write("a.pdf");
        tree.Write("b.pdf");
        using var cancel = new CancellationTokenSource();

        var walk = RootWalker.Create().Walk(Spec(tree.Root), _ => { }, cancellationToken: cancel.Token).GetEnumerator();
        Assert.True(walk.MoveNext());
        cancel.Cancel();

        Assert.Throws<OperationCanceledException>(() => walk.MoveNext());
        walk.Dispose();
    }
}
