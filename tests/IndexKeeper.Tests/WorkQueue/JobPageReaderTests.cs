using System.Security.Cryptography;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Service.WorkQueue;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>
/// A worker's check of a claimed job on real PDFs (PdfPig's builder): it encodes only the page the job was
/// published for, under this machine's path of the root; a changed file or page goes back, never encoded.
/// </summary>
public sealed class JobPageReaderTests
{
    private static readonly IDocumentReader Reader = DocumentReaderFactory.Create();

    private static (JobPageReader Reader, PageJob Job, string File) Setup(TempDirectory temp, int page = 2)
    {
        var file = temp.Combine("mounted", "docs", "register.pdf");
        Directory.CreateDirectory(Path.GetDirectoryName(file)!);
        File.WriteAllBytes(file, StorePdfs.Document("pump", 3));
        var content = Reader.Read(file, ReadLimits.Default, CancellationToken.None);

        // The job's file hash is SHA-256 of the bytes (FIPS 180-4, .NET's implementation), as the scan records it.
        var hash = Convert.ToHexStringLower(SHA256.HashData(File.ReadAllBytes(file)));
        var job = new PageJob(content.Pages[page - 1].Key.Hex, new string('a', 64), "docs", "register.pdf", page, hash, 0);
        var reader = new JobPageReader(new Dictionary<string, string> { ["docs"] = temp.Combine("mounted", "docs") }, FileHasher.Create(), Reader, ReadLimits.Default);
        return (reader, job, file);
    }

    [Fact]
    public void Unchanged_file_gives_the_jobs_page_with_its_words()
    {
        using var temp = new TempDirectory();
        var (reader, job, file) = Setup(temp);
        var (page, _, reason) = reader.Read(job, CancellationToken.None);
        Assert.True(page is not null, reason);
        Assert.Equal(job.PageKey, page.Key.Hex);
        Assert.Equal(2, page.PageNumber);
        Assert.Equal(file, page.SourcePath);
        Assert.Contains(page.Words, w => w.Text == "2");
    }

    [Fact]
    public void Changed_file_goes_back_unencoded()
    {
        using var temp = new TempDirectory();
        var (reader, job, file) = Setup(temp);
        File.WriteAllBytes(file, StorePdfs.Document("pump", 3, editedPage: 2, editedLine: "a later edit"));
        var (page, failure, _) = reader.Read(job, CancellationToken.None);
        Assert.Null(page);
        Assert.Equal(JobFailure.Changed, failure);
    }

    [Fact]
    public void Page_that_no_longer_shows_the_key_goes_back()
    {
        using var temp = new TempDirectory();
        var (reader, job, _) = Setup(temp);
        var (page, failure, _) = reader.Read(job with { PageNumber = 3 }, CancellationToken.None);
        Assert.Null(page);
        Assert.Equal(JobFailure.Changed, failure);
    }

    [Fact]
    public void Root_without_a_path_here_goes_back_for_another_worker()
    {
        using var temp = new TempDirectory();
        var (reader, job, _) = Setup(temp);
        var (page, failure, _) = reader.Read(job with { RootName = "elsewhere" }, CancellationToken.None);
        Assert.Null(page);
        Assert.Equal(JobFailure.Unmapped, failure);
    }

    [Fact]
    public void A_second_page_of_the_same_file_is_checked_too()
    {
        using var temp = new TempDirectory();
        var (reader, job, file) = Setup(temp);
        Assert.NotNull(reader.Read(job, CancellationToken.None).Page);

        // The document read for the first job is kept; a changed file must not be served from it.
        File.WriteAllBytes(file, StorePdfs.Document("pump", 3, editedPage: 2, editedLine: "a later edit"));
        Assert.Equal(JobFailure.Changed, reader.Read(job, CancellationToken.None).Failure);
    }
}
