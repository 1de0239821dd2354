using IndexKeeper.Core.Detect;

namespace IndexKeeper.Tests.Detect;

public sealed class MountTableTests
{
    // The sample line of the Linux kernel's Documentation/filesystems/proc.rst, "/proc/<pid>/mountinfo":
    // mount point /mnt2 (field 5), type ext3 after the "-" separator.
    private const string KernelSample = "36 35 98:0 /mnt1 /mnt2 rw,noatime master:1 - ext3 /dev/root rw,errors=continue";

    [Fact]
    public void The_longest_mount_point_holding_the_path_gives_its_type()
    {
        string[] table =
        [
            "22 1 8:1 / / rw,relatime shared:1 - ext4 /dev/sda1 rw",
            KernelSample,
            "40 22 0:45 / /srv/share rw,relatime shared:30 - nfs4 fileserver:/exports/share rw,vers=4.2",
            "41 22 0:46 / /srv/share-old rw,relatime - cifs //nas/old rw",
            "42 22 0:47 / /srv/with\\040space rw - smb3 //nas/space rw",
        ];

        Assert.Equal("ext3", MountTable.FileSystemTypeOf("/mnt2/reports/a.pdf", table));
        Assert.Equal("ext3", MountTable.FileSystemTypeOf("/mnt2", table));
        Assert.Equal("ext4", MountTable.FileSystemTypeOf("/mnt20", table));
        Assert.Equal("nfs4", MountTable.FileSystemTypeOf("/srv/share/minutes", table));
        Assert.Equal("cifs", MountTable.FileSystemTypeOf("/srv/share-old", table));
        Assert.Equal("smb3", MountTable.FileSystemTypeOf("/srv/with space/drawings", table));
        Assert.Equal("ext4", MountTable.FileSystemTypeOf("/home", table));
    }

    [Theory]
    [InlineData("nfs", true)]
    [InlineData("nfs4", true)]
    [InlineData("cifs", true)]
    [InlineData("smb3", true)]
    [InlineData("ext4", false)]
    [InlineData("tmpfs", false)]
    [InlineData(null, false)]
    public void Network_types_are_told_apart_from_local_ones(string? type, bool network) =>
        Assert.Equal(network, MountTable.IsNetwork(type));

    [LinuxFact]
    public void A_scratch_folder_of_this_machine_is_local_and_its_type_is_the_kernels()
    {
        using var temp = new Support.TempDirectory();
        var type = MountTable.FileSystemTypeOf(temp.Path);

        // The kernel's own answer for the same folder: findmnt (util-linux) reads the same table.
        var findmnt = System.Diagnostics.Process.Start(new System.Diagnostics.ProcessStartInfo("findmnt", ["--noheadings", "--output", "FSTYPE", "--target", temp.Path]) { RedirectStandardOutput = true })!;
        var expected = findmnt.StandardOutput.ReadToEnd().Trim();
        findmnt.WaitForExit();
        Assert.Equal(expected, type);
        Assert.False(MountTable.IsNetwork(type));
    }
}
