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

    private static (JobPageReader Reader, PageJob Job, string File) Setup(TempDirectory temp, int page = 2, IFileHasher? hasher = null)
    {
        var file = temp.Combine("mounted", "docs", "register.pdf");
        Directory.CreateDirectory(Path.GetDirectoryName(file)!);
        File.WriteAllBytes(file, StorePdfs.Document("pump", 3));
        var content = Reader.Read(file, ReadLimits.Default, CancellationToken.None);

        // The job's file hash is SHA-256 of the bytes (FIPS 180-4, .NET's implementation), as the scan records it.
        var hash = Convert.ToHexStringLower(SHA256.HashData(File.ReadAllBytes(file)));
        var job = new PageJob(content.Pages[page - 1].Key.Hex, new string('a', 64), "docs", "register.pdf", page, hash, 0);
        var reader = new JobPageReader(new Dictionary<string, string> { ["docs"] = temp.Combine("mounted", "docs") }, hasher ?? FileHasher.Create(), Reader, ReadLimits.Default);
        return (reader, job, file);
    }

    [Fact]
    public void Unchanged_file_gives_the_jobs_page_with_its_words()
    {
        using var temp = new TempDirectory();
        var (reader, job, file) = Setup(temp);
        var (page, _, reason) = reader.Read([job], CancellationToken.None)[0];
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
        var (page, failure, _) = reader.Read([job], CancellationToken.None)[0];
        Assert.Null(page);
        Assert.Equal(JobFailure.Changed, failure);
    }

    [Fact]
    public void Page_that_no_longer_shows_the_key_goes_back()
    {
        using var temp = new TempDirectory();
        var (reader, job, _) = Setup(temp);
        var (page, failure, _) = reader.Read([job with { PageNumber = 3 }], CancellationToken.None)[0];
        Assert.Null(page);
        Assert.Equal(JobFailure.Changed, failure);
    }

    [Fact]
    public void Root_without_a_path_here_goes_back_for_another_worker()
    {
        using var temp = new TempDirectory();
        var (reader, job, _) = Setup(temp);
        var (page, failure, _) = reader.Read([job with { RootName = "elsewhere" }], CancellationToken.None)[0];
        Assert.Null(page);
        Assert.Equal(JobFailure.Unmapped, failure);
    }

    [Fact]
    public void A_second_page_of_the_same_file_is_checked_too()
    {
        using var temp = new TempDirectory();
        var (reader, job, file) = Setup(temp);
        Assert.NotNull(reader.Read([job], CancellationToken.None)[0].Page);

        // The document read for the first job is kept; a changed file must not be served from it.
        File.WriteAllBytes(file, StorePdfs.Document("pump", 3, editedPage: 2, editedLine: "a later edit"));
        Assert.Equal(JobFailure.Changed, reader.Read([job], CancellationToken.None)[0].Failure);
    }

    [Fact]
    public void A_batch_hashes_each_file_once_and_the_next_batch_hashes_it_again()
    {
        using var temp = new TempDirectory();
        var hasher = new CountingHasher();
        var (reader, job, file) = Setup(temp, hasher: hasher);
        var pages = ReaderPages(file);
        var batch = Enumerable.Range(1, 3).Select(n => job with { PageNumber = n, PageKey = pages[n - 1] }).ToList();

        var read = reader.Read(batch, CancellationToken.None);
        Assert.All(read, r => Assert.NotNull(r.Page));
        Assert.Equal(1, hasher.Calls);

        // A file changed between two batches: the second batch's own hash finds it, the kept document is not served.
        File.WriteAllBytes(file, StorePdfs.Document("pump", 3, editedPage: 2, editedLine: "a later edit"));
        Assert.All(reader.Read(batch, CancellationToken.None), r => Assert.Equal(JobFailure.Changed, r.Failure));
        Assert.Equal(2, hasher.Calls);
    }

    [Fact]
    public void A_job_published_under_another_file_hash_goes_back_though_its_batch_neighbour_matches()
    {
        using var temp = new TempDirectory();
        var (reader, job, _) = Setup(temp);
        var read = reader.Read([job, job with { PageNumber = 3, FileHash = new string('0', 64) }], CancellationToken.None);
        Assert.NotNull(read[0].Page);
        Assert.Null(read[1].Page);
        Assert.Equal(JobFailure.Changed, read[1].Failure);
    }

    private static string[] ReaderPages(string file) => [.. Reader.Read(file, ReadLimits.Default, CancellationToken.None).Pages.Select(p => p.Key.Hex)];

    /// <summary>The real hasher, counting its calls.</summary>
    private sealed class CountingHasher : IFileHasher
    {
        private readonly IFileHasher inner = FileHasher.Create();

        public int Calls { get; private set; }

        public FileHashResult Hash(string path, CancellationToken cancellationToken)
        {
            Calls++;
            return inner.Hash(path, cancellationToken);
        }

        public FileHashResult Hash(FoundFile file, CancellationToken cancellationToken)
        {
            Calls++;
            return inner.Hash(file, cancellationToken);
        }
    }
}
