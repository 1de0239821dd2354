using IndexKeeper.Core.Detect;

namespace IndexKeeper.Tests.Detect;

public sealed class QuickCheckTests
{
    private static readonly long Written = new DateTime(2024, 3, 1, 8, 0, 0, DateTimeKind.Utc).Ticks;
    private static readonly FileIdentity Inode = new(2049, 131_077);
    private static readonly FileStat Baseline = new(48_213, Written, Inode);
    private static readonly byte[] Digest = Enumerable.Range(0, 32).Select(i => (byte)i).ToArray();
    private static readonly long CheckedLater = Written + TimeSpan.FromHours(1).Ticks;

    private static StoredFileState Stored(FileStat stat, byte[]? hash = null, long? checkedAt = null) =>
        new(stat, hash ?? Digest, checkedAt ?? CheckedLater);

    public enum IdentityCase
    {
        Same,
        Other,
        StoredNone,
        BothNone,
    }

    [Fact]
    public void Covers_every_combination_of_the_quick_check_inputs()
    {
        var seen = new HashSet<StatDifferences>();
        foreach (var hashKnown in new[] { true, false })
        {
            foreach (var sizeChanged in new[] { false, true })
            {
                foreach (var timeChanged in new[] { false, true })
                {
                    foreach (var identity in Enum.GetValues<IdentityCase>())
                    {
                        foreach (var racy in new[] { false, true })
                        {
                            var storedIdentity = identity is IdentityCase.StoredNone or IdentityCase.BothNone ? FileIdentity.None : Inode;
                            var freshIdentity = identity switch
                            {
                                IdentityCase.Other => new FileIdentity(Inode.Device, Inode.Index + 1),
                                IdentityCase.BothNone => FileIdentity.None,
                                _ => Inode,
                            };
                            var stored = new StoredFileState(
                                Baseline with { Identity = storedIdentity },
                                hashKnown ? Digest : null,
                                racy ? Written + TimeSpan.FromSeconds(1).Ticks : CheckedLater);
                            var fresh = new FileStat(
                                Baseline.Size + (sizeChanged ? 1 : 0),
                                Baseline.ModifiedTicksUtc + (timeChanged ? 10 : 0),
                                freshIdentity);

                            var result = QuickCheck.BeforeHash(stored, fresh);

                            var expected = (hashKnown ? StatDifferences.None : StatDifferences.NeverHashed)
                                | (sizeChanged ? StatDifferences.Size : StatDifferences.None)
                                | (timeChanged ? StatDifferences.Modified : StatDifferences.None)
                                | (identity is IdentityCase.Other or IdentityCase.StoredNone ? StatDifferences.Identity : StatDifferences.None)
                                | (racy ? StatDifferences.Racy : StatDifferences.None);
                            Assert.Equal(expected, result.Differences);
                            Assert.Equal(expected == StatDifferences.None ? QuickCheckVerdict.Unchanged : QuickCheckVerdict.NeedsHash, result.Verdict);
                            seen.Add(result.Differences);
                        }
                    }
                }
            }
        }

        // Each input is told apart on its own: 2 (hash) x 2 (size) x 2 (time) x 2 (identity differs or not) x 2 (racy).
        Assert.Equal(32, seen.Count);
    }

    [Fact]
    public void A_new_file_needs_a_hash()
    {
        Assert.Equal(new QuickCheckResult(QuickCheckVerdict.NeedsHash, StatDifferences.New), QuickCheck.BeforeHash(null, Baseline));
    }

    [Theory]
    [InlineData(0, true)] // written at the very moment of the stat
    [InlineData(-1, true)] // stat one tick before the write (clock skew): can vouch for nothing
    [InlineData(19_999_999, true)] // 1.9999999 s after: inside the 2 s window
    [InlineData(20_000_000, true)] // exactly 2 s: the boundary counts as racy
    [InlineData(20_000_001, false)]
    public void Treats_a_stat_taken_within_the_racy_window_as_unproven(long checkedAfterWriteTicks, bool racy)
    {
        var result = QuickCheck.BeforeHash(Stored(Baseline, checkedAt: Written + checkedAfterWriteTicks), Baseline);

        Assert.Equal(racy ? StatDifferences.Racy : StatDifferences.None, result.Differences);
    }

    [Fact]
    public void A_zero_racy_window_only_flags_stats_taken_no_later_than_the_write()
    {
        Assert.Equal(StatDifferences.None, QuickCheck.BeforeHash(Stored(Baseline, checkedAt: Written + 1), Baseline, TimeSpan.Zero).Differences);
        Assert.Equal(StatDifferences.Racy, QuickCheck.BeforeHash(Stored(Baseline, checkedAt: Written), Baseline, TimeSpan.Zero).Differences);
        Assert.Throws<ArgumentOutOfRangeException>(() => QuickCheck.BeforeHash(Stored(Baseline), Baseline, TimeSpan.FromTicks(-1)));
    }

    [Fact]
    public void Everyday_edits_map_to_the_expected_differences()
    {
        var stored = Stored(Baseline);
        // touch: only the time moves.
        Assert.Equal(StatDifferences.Modified, QuickCheck.BeforeHash(stored, Baseline with { ModifiedTicksUtc = Written + 1 }).Differences);
        // cp -p over the file: new inode, same size and time.
        Assert.Equal(StatDifferences.Identity, QuickCheck.BeforeHash(stored, Baseline with { Identity = new FileIdentity(2049, 9) }).Differences);
        // Moved to another file system by copy: new device.
        Assert.Equal(StatDifferences.Identity, QuickCheck.BeforeHash(stored, Baseline with { Identity = new FileIdentity(2050, Inode.Index) }).Differences);
        // An editor's save: everything moves.
        Assert.Equal(StatDifferences.Size | StatDifferences.Modified | StatDifferences.Identity,
            QuickCheck.BeforeHash(stored, new FileStat(50_000, Written + 5, new FileIdentity(2049, 7))).Differences);
    }

    public static TheoryData<FileHashStatus, string, HashVerdict> AfterHashCases()
    {
        var data = new TheoryData<FileHashStatus, string, HashVerdict>();
        var stableVerdicts = new Dictionary<string, HashVerdict>
        {
            ["none"] = HashVerdict.ContentChanged,
            ["never-hashed"] = HashVerdict.ContentChanged,
            ["same"] = HashVerdict.Unchanged,
            ["different"] = HashVerdict.ContentChanged,
        };
        foreach (var status in Enum.GetValues<FileHashStatus>())
        {
            foreach (var (stored, stableVerdict) in stableVerdicts)
            {
                data.Add(status, stored, status switch
                {
                    FileHashStatus.Stable => stableVerdict,
                    FileHashStatus.Unstable => HashVerdict.Retry,
                    FileHashStatus.Missing => HashVerdict.Vanished,
                    FileHashStatus.Inaccessible or FileHashStatus.NotRegularFile => HashVerdict.Unreadable,
                    _ => throw new InvalidOperationException("a status without an expected verdict"),
                });
            }
        }

        return data;
    }

    [Theory]
    [MemberData(nameof(AfterHashCases))]
    public void Decides_after_hashing_for_every_status_and_stored_state(FileHashStatus status, string storedCase, HashVerdict expected)
    {
        var stored = storedCase switch
        {
            "none" => null,
            "never-hashed" => new StoredFileState(Baseline, null, CheckedLater),
            "same" => Stored(Baseline, (byte[])Digest.Clone()),
            _ => Stored(Baseline, Enumerable.Repeat((byte)0xAB, 32).ToArray()),
        };
        var result = new FileHashResult(status, status == FileHashStatus.Stable ? (byte[])Digest.Clone() : null, Baseline, Baseline with { ModifiedTicksUtc = Written + 3 }, CheckedLater, null);

        Assert.Equal(expected, QuickCheck.AfterHash(stored, result));
    }
}
