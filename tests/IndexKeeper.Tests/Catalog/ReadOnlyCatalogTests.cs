using System.Security.Cryptography;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Catalog;

/// <summary>The plan's read-only catalog: it reads what a writer committed and changes no byte on disk.</summary>
public sealed class ReadOnlyCatalogTests
{
    [Fact]
    public void Reads_committed_work_and_leaves_every_file_as_it_was()
    {
        using var temp = new TempDirectory();
        using (var held = IndexLock.Acquire(temp.Path, "writer"))
        using (var catalog = IndexCatalog.Open(held))
        {
            catalog.History.RecordEmbedding("enc-a", DateTime.UtcNow, 2.0, pagesEmbedded: 10, vectorsWritten: 40, encoderSeconds: 1.5);
        }

        var before = Hashes(temp.Path);
        using (var held = ReaderGate.EnterShared(temp.Path))
        using (var catalog = IndexCatalog.OpenReadOnly(held))
        {
            var history = Assert.Single(catalog.History.Embeds("enc-a", 20));
            Assert.Equal((10L, 1.5), (history.Counts["pagesEmbedded"], history.EncoderSeconds));
            Assert.Empty(catalog.History.Embeds("enc-b", 20));
            Assert.Null(catalog.History.LastScanUtc());
        }

        Assert.Equal(before, Hashes(temp.Path));
    }

    [Fact]
    public void A_crashed_writers_log_is_read_and_not_folded_into_the_file()
    {
        // A writer still open (as after a crash) leaves committed transactions in LiteDB's log file;
        // copies of both files are what the next process finds.
        using var temp = new TempDirectory();
        var copy = Directory.CreateDirectory(Path.Combine(temp.Path, "copy")).FullName;
        var live = Directory.CreateDirectory(Path.Combine(temp.Path, "live")).FullName;
        using (var held = IndexLock.Acquire(live, "writer"))
        using (var catalog = IndexCatalog.Open(held))
        {
            catalog.History.RecordEmbedding("enc-a", DateTime.UtcNow, 1.0, pagesEmbedded: 3, vectorsWritten: 9, encoderSeconds: 0.75);
            foreach (var file in Directory.GetFiles(live, "catalog*"))
            {
                File.Copy(file, Path.Combine(copy, Path.GetFileName(file)));
            }
        }

        Assert.True(File.Exists(Path.Combine(copy, "catalog-log.db")));
        var before = Hashes(copy);
        using (var held = ReaderGate.EnterShared(copy))
        using (var catalog = IndexCatalog.OpenReadOnly(held))
        {
            Assert.Equal(3, Assert.Single(catalog.History.Embeds("enc-a", 20)).Counts["pagesEmbedded"]);
        }

        Assert.Equal(before, Hashes(copy));
    }

    [Fact]
    public void A_folder_without_a_catalog_reads_as_empty_and_gets_none()
    {
        using var temp = new TempDirectory();
        using (var held = ReaderGate.EnterShared(temp.Path))
        using (var catalog = IndexCatalog.OpenReadOnly(held))
        {
            Assert.Empty(catalog.Queue.Keys());
            Assert.Equal(0, catalog.Figures().Documents);
        }

        Assert.False(File.Exists(Path.Combine(temp.Path, CatalogSchema.FileName)));
    }

    /// <summary>SHA-256 (FIPS 180-4) of each catalog file, by name.</summary>
    private static string Hashes(string folder) => string.Join('\n', Directory.GetFiles(folder, "catalog*").Order(StringComparer.Ordinal)
        .Select(f => $"{Path.GetFileName(f)} {Convert.ToHexString(SHA256.HashData(File.ReadAllBytes(f)))}"));
}
