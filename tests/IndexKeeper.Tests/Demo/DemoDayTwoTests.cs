using IndexKeeper.Demo;
using UglyToad.PdfPig;

namespace IndexKeeper.Tests.Demo;

[Collection(DemoStoreCollection.Name)]
public sealed class DemoDayTwoTests(DemoStoreFixture store)
{
    [Fact]
    public void Each_kind_of_change_happens_once_with_a_description()
    {
        Assert.Equal(Enum.GetValues<DemoChangeKind>().Order(), store.Changes.Select(change => change.Kind).Order());
        Assert.All(store.Changes, change => Assert.False(string.IsNullOrWhiteSpace(change.Description)));
    }

    [Fact]
    public void Files_are_where_each_change_says()
    {
        foreach (var change in store.Changes)
        {
            if (change.PathAfter is not null)
            {
                Assert.True(File.Exists(Full(change.PathAfter)), $"{change.Kind}: {change.PathAfter} is missing");
            }

            bool sourceGoes = change.Kind is DemoChangeKind.Renamed or DemoChangeKind.Moved or DemoChangeKind.Deleted;
            if (change.PathBefore is not null && sourceGoes)
            {
                Assert.False(File.Exists(Full(change.PathBefore)), $"{change.Kind}: {change.PathBefore} is still there");
            }

            if (change.Kind == DemoChangeKind.Added)
            {
                Assert.False(store.SecondHashesBefore.ContainsKey(change.PathAfter!));
            }
        }
    }

    [Fact]
    public void Copies_renames_and_moves_keep_the_bytes()
    {
        foreach (var change in store.Changes.Where(change => change.Kind is DemoChangeKind.Copied or DemoChangeKind.Renamed or DemoChangeKind.Moved))
        {
            Assert.Equal(store.SecondHashesBefore[change.PathBefore!], HashOf(change.PathAfter!));
        }

        var copy = store.Changes.Single(change => change.Kind == DemoChangeKind.Copied);
        Assert.True(File.Exists(Full(copy.PathBefore!)));
    }

    [Fact]
    public void The_touched_file_has_the_same_bytes_and_a_new_time()
    {
        var touched = store.Changes.Single(change => change.Kind == DemoChangeKind.Touched);
        Assert.Equal(store.SecondHashesBefore[touched.PathAfter!], HashOf(touched.PathAfter!));
        Assert.NotEqual(store.TimesBefore[touched.PathAfter!], File.GetLastWriteTimeUtc(Full(touched.PathAfter!)));
    }

    [Fact]
    public void The_metadata_resave_changes_bytes_and_metadata_but_no_page()
    {
        var resaved = store.Changes.Single(change => change.Kind == DemoChangeKind.MetadataResaved);
        string path = resaved.PathAfter!;
        Assert.NotEqual(store.SecondHashesBefore[path], HashOf(path));
        Assert.Equal(store.SignaturesBefore[path], store.SignaturesAfter[path]);

        using var before = PdfDocument.Open(DemoStoreFixture.FullPath(store.FirstDirectory, path));
        using var after = PdfDocument.Open(Full(path));
        Assert.NotEqual(before.Information.Title, after.Information.Title);
        Assert.NotEqual(before.Information.Author, after.Information.Author);
        Assert.NotEqual(before.Information.ModifiedDate, after.Information.ModifiedDate);
    }

    [Fact]
    public void The_edited_manual_differs_on_exactly_the_stated_page()
    {
        var edited = store.Changes.Single(change => change.Kind == DemoChangeKind.PageEdited);
        var before = store.SignaturesBefore[edited.PathBefore!];
        var after = store.SignaturesAfter[edited.PathAfter!];
        Assert.Equal(before.Count, after.Count);
        var differing = Enumerable.Range(1, before.Count).Where(page => before[page - 1] != after[page - 1]).ToList();
        Assert.Equal(edited.PagesNew, differing);
        Assert.Equal(edited.PagesGone, differing);
        Assert.NotEqual(TextOf(DemoStoreFixture.FullPath(store.FirstDirectory, edited.PathBefore!), differing[0]), TextOf(Full(edited.PathAfter!), differing[0]));
    }

    [Fact]
    public void The_reordered_manual_keeps_every_page_and_gains_one()
    {
        var reordered = store.Changes.Single(change => change.Kind == DemoChangeKind.PagesReorderedAndInserted);
        var before = store.SignaturesBefore[reordered.PathBefore!];
        var after = store.SignaturesAfter[reordered.PathAfter!];
        Assert.Equal(before.Count + 1, after.Count);
        Assert.NotEqual(before, after.Where((_, index) => index + 1 != reordered.PagesNew[0]).ToList());
        Assert.Equal(before.Order(StringComparer.Ordinal), after.Where((_, index) => index + 1 != reordered.PagesNew[0]).Order(StringComparer.Ordinal));
        Assert.DoesNotContain(after[reordered.PagesNew[0] - 1], before);
    }

    [Fact]
    public void New_and_gone_pages_of_the_whole_store_are_exactly_the_stated_ones()
    {
        var before = store.SignaturesBefore.Values.SelectMany(pages => pages).ToHashSet();
        var after = store.SignaturesAfter.Values.SelectMany(pages => pages).ToHashSet();

        var statedNew = store.Changes.SelectMany(change => change.PagesNew.Select(page => store.SignaturesAfter[change.PathAfter!][page - 1])).ToHashSet();
        var statedGone = store.Changes.SelectMany(change => change.PagesGone.Select(page => store.SignaturesBefore[change.PathBefore!][page - 1])).ToHashSet();

        Assert.Equal(after.Except(before).Order(StringComparer.Ordinal), statedNew.Order(StringComparer.Ordinal));
        Assert.Equal(before.Except(after).Order(StringComparer.Ordinal), statedGone.Order(StringComparer.Ordinal));
    }

    [Fact]
    public void Rewritten_pdfs_pass_qpdf_and_pdfinfo()
    {
        foreach (var change in store.Changes.Where(change => change.PathAfter is not null && change.PathAfter.EndsWith(".pdf", StringComparison.Ordinal)))
        {
            // qpdf manual, "Exit Status": 0 means no errors or warnings.
            var (exitCode, output) = ExternalTool.Run("qpdf", "--check", Full(change.PathAfter!));
            Assert.True(exitCode == 0, $"{change.PathAfter}: {output}");
            Assert.Equal(store.SignaturesAfter[change.PathAfter!].Count, ExternalTool.PdfinfoPageCount(Full(change.PathAfter!)));
        }
    }

    [Fact]
    public void Day_two_runs_once()
    {
        Assert.Throws<InvalidOperationException>(() => DemoStore.ApplyDayTwoChanges(store.SecondDirectory));
    }

    [Fact]
    public void Day_two_needs_a_generated_store()
    {
        string empty = Path.Combine(Path.GetTempPath(), "indexkeeper-demo-none-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(empty);
        try
        {
            Assert.Throws<InvalidOperationException>(() => DemoStore.ApplyDayTwoChanges(empty));
        }
        finally
        {
            Directory.Delete(empty);
        }
    }

    private string Full(string storePath) => DemoStoreFixture.FullPath(store.SecondDirectory, storePath);

    private string HashOf(string storePath) =>
        Convert.ToHexString(System.Security.Cryptography.SHA256.HashData(File.ReadAllBytes(Full(storePath))));

    private static string TextOf(string path, int page)
    {
        using var document = PdfDocument.Open(path);
        return document.GetPage(page).Text;
    }
}
