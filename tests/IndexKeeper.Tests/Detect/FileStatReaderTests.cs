using System.Globalization;
using IndexKeeper.Core.Detect;

namespace IndexKeeper.Tests.Detect;

public sealed class FileStatReaderTests
{
    [Fact]
    public void Matches_coreutils_stat_for_inode_device_size_and_time()
    {
        using var tree = new TempTree();
        var path = tree.Write("report.pdf", new byte[12345]);

        var entry = FileStatReader.Read(path);

        // Independent tool: coreutils stat (%i inode, %d device number, %s size, %.9Y mtime with nanoseconds).
        var fields = TempTree.Run("stat", "-c", "%i %d %s %.9Y", path).Trim().Split(' ');
        Assert.Equal(EntryKind.RegularFile, entry.Kind);
        Assert.Equal(ulong.Parse(fields[0], CultureInfo.InvariantCulture), entry.Stat.Identity.Index);
        Assert.Equal(ulong.Parse(fields[1], CultureInfo.InvariantCulture), entry.Stat.Identity.Device);
        Assert.Equal(long.Parse(fields[2], CultureInfo.InvariantCulture), entry.Stat.Size);
        var seconds = fields[3].Split('.');
        var expectedTicks = DateTime.UnixEpoch.Ticks + (long.Parse(seconds[0], CultureInfo.InvariantCulture) * TimeSpan.TicksPerSecond)
            + (long.Parse(seconds[1], CultureInfo.InvariantCulture) / 100);
        Assert.Equal(expectedTicks, entry.Stat.ModifiedTicksUtc);
    }

    [Fact]
    public void Keeps_sub_second_precision()
    {
        using var tree = new TempTree();
        var path = tree.Write("a.pdf");
        var when = new DateTime(2024, 5, 6, 7, 8, 9, DateTimeKind.Utc).AddTicks(1234567);
        File.SetLastWriteTimeUtc(path, when);

        Assert.Equal(when.Ticks, FileStatReader.Read(path).Stat.ModifiedTicksUtc);
    }

    [Fact]
    public void Identity_survives_rename_and_differs_after_copy()
    {
        using var tree = new TempTree();
        var original = tree.Write("manual.pdf", "pump station manual");
        var identity = FileStatReader.Read(original).Stat.Identity;
        var renamed = tree.PathOf("manual-renamed.pdf");
        File.Move(original, renamed);
        var copy = tree.PathOf("manual-copy.pdf");
        File.Copy(renamed, copy);

        var afterRename = FileStatReader.Read(renamed).Stat.Identity;
        var ofCopy = FileStatReader.Read(copy).Stat.Identity;

        Assert.NotEqual(FileIdentity.None, identity);
        Assert.Equal(identity, afterRename);
        Assert.NotEqual(identity, ofCopy);
        // Independent tool: coreutils stat -c %i gives the same inode numbers.
        Assert.Equal(TempTree.Run("stat", "-c", "%i", renamed).Trim(), afterRename.Index.ToString(CultureInfo.InvariantCulture));
        Assert.Equal(TempTree.Run("stat", "-c", "%i", copy).Trim(), ofCopy.Index.ToString(CultureInfo.InvariantCulture));
    }

    [Fact]
    public void Tells_links_folders_pipes_and_missing_apart_without_following()
    {
        using var tree = new TempTree();
        var file = tree.Write("f.pdf");
        var link = tree.PathOf("link.pdf");
        File.CreateSymbolicLink(link, file);
        var fifo = tree.PathOf("pipe");
        TempTree.Run("mkfifo", fifo);

        Assert.Equal(EntryKind.Link, FileStatReader.Read(link).Kind);
        Assert.Equal(EntryKind.Directory, FileStatReader.Read(tree.Root).Kind);
        Assert.Equal(EntryKind.Other, FileStatReader.Read(fifo).Kind);
        var missing = FileStatReader.Read(tree.PathOf("nothing.pdf"));
        Assert.Equal(EntryKind.Missing, missing.Kind);
        Assert.NotNull(missing.Error);
        Assert.Equal(EntryKind.Missing, FileStatReader.Read(Path.Combine(file, "below-a-file")).Kind);
    }

    [Fact]
    public void Handle_stat_equals_path_stat()
    {
        using var tree = new TempTree();
        var path = tree.Write("f.pdf", new byte[777]);
        using var handle = File.OpenHandle(path);

        Assert.Equal(FileStatReader.Read(path).Stat, FileStatReader.Read(handle));
    }
}
