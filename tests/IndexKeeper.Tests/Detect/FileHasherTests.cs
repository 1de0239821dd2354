using IndexKeeper.Core.Detect;

namespace IndexKeeper.Tests.Detect;

public sealed class FileHasherTests
{
    private static readonly DateTime LongAgo = new(2001, 2, 3, 4, 5, 6, DateTimeKind.Utc);

    private static IFileHasher WithHook(Action<long> afterChunk, int bufferSize = 1024) =>
        new StreamingFileHasher(bufferSize, TimeProvider.System, afterChunk);

    private static byte[] RandomBytes(int length, int seed)
    {
        var bytes = new byte[length];
        new Random(seed).NextBytes(bytes);
        return bytes;
    }

    [LinuxFact]
    public void Agrees_with_sha256sum_on_a_multi_chunk_file()
    {
        using var tree = new TempTree();
        var path = tree.Write("survey.pdf", RandomBytes(3_000_017, seed: 1));

        var result = FileHasher.Create(bufferSize: 65_537).Hash(path, CancellationToken.None);

        // Independent tool: coreutils sha256sum.
        Assert.Equal(TempTree.Run("sha256sum", path).Split(' ')[0], Convert.ToHexStringLower(result.Sha256!));
        Assert.True(result.Stable);
        Assert.Null(result.Detail);
    }

    [LinuxFact]
    public void Appending_while_hashing_is_unstable()
    {
        using var tree = new TempTree();
        var path = tree.Write("log.pdf", RandomBytes(10_000, seed: 2));
        var hasher = WithHook(read =>
        {
            if (read == 1024)
            {
                File.AppendAllText(path, "more");
            }
        });

        var result = hasher.Hash(path, CancellationToken.None);

        Assert.Equal(FileHashStatus.Unstable, result.Status);
        Assert.Null(result.Sha256);
        Assert.NotEqual(result.Before.Size, result.After.Size);
    }

    [LinuxFact]
    public void Overwriting_in_place_with_the_same_size_is_unstable()
    {
        using var tree = new TempTree();
        var path = tree.Write("form.pdf", RandomBytes(10_000, seed: 3));
        File.SetLastWriteTimeUtc(path, LongAgo);
        var hasher = WithHook(read =>
        {
            if (read == 1024)
            {
                using var stream = new FileStream(path, FileMode.Open, FileAccess.Write);
                stream.Write(new byte[100]);
            }
        });

        var result = hasher.Hash(path, CancellationToken.None);

        Assert.Equal(FileHashStatus.Unstable, result.Status);
        Assert.Equal(result.Before.Size, result.After.Size);
        Assert.NotEqual(result.Before.ModifiedTicksUtc, result.After.ModifiedTicksUtc);
    }

    [LinuxFact]
    public void Replacing_by_rename_while_hashing_is_unstable()
    {
        using var tree = new TempTree();
        var path = tree.Write("report.pdf", RandomBytes(10_000, seed: 4));
        File.SetLastWriteTimeUtc(path, LongAgo);
        var replacement = tree.Write("report.tmp", RandomBytes(10_000, seed: 4));
        File.SetLastWriteTimeUtc(replacement, LongAgo);
        var hasher = WithHook(read =>
        {
            if (read == 1024)
            {
                File.Move(replacement, path, overwrite: true);
            }
        });

        var result = hasher.Hash(path, CancellationToken.None);

        // Same bytes, size and time: only the identity tells that another file now has the name.
        Assert.Equal(FileHashStatus.Unstable, result.Status);
        Assert.NotEqual(result.Before.Identity, result.After.Identity);
    }

    [LinuxFact]
    public void A_file_replaced_since_its_walk_is_unstable()
    {
        using var tree = new TempTree();
        tree.Write("a.pdf", "first");
        var found = RootWalker.Create().Walk(new RootSpec("docs", tree.Root, [], []), _ => { }).Single();
        File.Move(tree.Write("new.tmp", "other"), found.FullPath, overwrite: true);

        var result = FileHasher.Create().Hash(found, CancellationToken.None);

        Assert.Equal(FileHashStatus.Unstable, result.Status);
        Assert.Equal(found.Stat, result.Before);
    }

    [LinuxFact]
    public void A_link_put_in_place_of_a_walked_file_is_not_read()
    {
        using var tree = new TempTree();
        var secret = tree.Write("outside/secret.pdf", "not ours");
        tree.Write("docs/a.pdf", "ours");
        var found = RootWalker.Create().Walk(new RootSpec("docs", tree.PathOf("docs"), [], []), _ => { }).Single();
        File.Delete(found.FullPath);
        File.CreateSymbolicLink(found.FullPath, secret);

        var viaWalk = FileHasher.Create().Hash(found, CancellationToken.None);
        var viaPath = FileHasher.Create().Hash(found.FullPath, CancellationToken.None);

        Assert.Equal(FileHashStatus.Unstable, viaWalk.Status);
        Assert.Null(viaWalk.Sha256);
        Assert.Equal(FileHashStatus.NotRegularFile, viaPath.Status);
        Assert.Throws<IOException>(() => FileOpener.OpenRead(found.FullPath));
    }

    [LinuxFact]
    public void Refuses_missing_files_folders_and_pipes_without_blocking()
    {
        using var tree = new TempTree();
        TempTree.Run("mkfifo", tree.PathOf("pipe.pdf"));
        var hasher = FileHasher.Create();

        Assert.Equal(FileHashStatus.Missing, hasher.Hash(tree.PathOf("gone.pdf"), CancellationToken.None).Status);
        Assert.Equal(FileHashStatus.NotRegularFile, hasher.Hash(tree.Root, CancellationToken.None).Status);
        Assert.Equal(FileHashStatus.NotRegularFile, hasher.Hash(tree.PathOf("pipe.pdf"), CancellationToken.None).Status);
        Assert.Throws<FileNotFoundException>(() => FileOpener.OpenRead(tree.PathOf("gone.pdf")));
    }

    [LinuxFact]
    public void Stops_when_cancelled_mid_file()
    {
        using var tree = new TempTree();
        var path = tree.Write("big.pdf", RandomBytes(100_000, seed: 5));
        using var cancel = new CancellationTokenSource();
        var chunks = 0;
        var hasher = WithHook(_ =>
        {
            chunks++;
            cancel.Cancel();
        });

        Assert.Throws<OperationCanceledException>(() => hasher.Hash(path, cancel.Token));
        Assert.Equal(1, chunks);
    }

    [LinuxFact]
    public void Stamps_the_result_with_the_clock_it_was_given()
    {
        using var tree = new TempTree();
        var path = tree.Write("a.pdf");
        var clock = new FixedClock(new DateTimeOffset(2030, 1, 2, 3, 4, 5, TimeSpan.Zero));

        var result = FileHasher.Create(clock: clock).Hash(path, CancellationToken.None);

        Assert.Equal(clock.GetUtcNow().UtcTicks, result.CheckedAtTicksUtc);
    }

    private sealed class FixedClock(DateTimeOffset now) : TimeProvider
    {
        public override DateTimeOffset GetUtcNow() => now;
    }
}
