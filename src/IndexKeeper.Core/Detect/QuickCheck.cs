namespace IndexKeeper.Core.Detect;

/// <summary>
/// The pure decisions of the Detect stage: from stored and fresh stats, is a hash needed; from the hash,
/// did the content change. No disk, no clock: the times come in with the data.
/// </summary>
public static class QuickCheck
{
    /// <summary>
    /// Racy window: a stat taken less than this after the file's last write cannot vouch for it. Two
    /// seconds covers the coarsest common timestamp (FAT keeps write times in 2 s steps, from memory) and
    /// the kernel's coarse clock on Linux file systems (a few milliseconds, from memory).
    /// </summary>
    public static readonly TimeSpan DefaultRacyWindow = TimeSpan.FromSeconds(2);

    public static QuickCheckResult BeforeHash(StoredFileState? stored, FileStat fresh) => BeforeHash(stored, fresh, DefaultRacyWindow);

    public static QuickCheckResult BeforeHash(StoredFileState? stored, FileStat fresh, TimeSpan racyWindow)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(racyWindow, TimeSpan.Zero);
        if (stored is null)
        {
            return new QuickCheckResult(QuickCheckVerdict.NeedsHash, StatDifferences.New);
        }

        var differences = StatDifferences.None;
        if (stored.Sha256 is null)
        {
            differences |= StatDifferences.NeverHashed;
        }

        if (stored.Stat.Size != fresh.Size)
        {
            differences |= StatDifferences.Size;
        }

        if (stored.Stat.ModifiedTicksUtc != fresh.ModifiedTicksUtc)
        {
            differences |= StatDifferences.Modified;
        }

        if (stored.Stat.Identity != fresh.Identity)
        {
            differences |= StatDifferences.Identity;
        }

        if (stored.Stat.ModifiedTicksUtc >= stored.CheckedAtTicksUtc - racyWindow.Ticks)
        {
            differences |= StatDifferences.Racy;
        }

        return new QuickCheckResult(differences == StatDifferences.None ? QuickCheckVerdict.Unchanged : QuickCheckVerdict.NeedsHash, differences);
    }

    public static HashVerdict AfterHash(StoredFileState? stored, FileHashResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        return result.Status switch
        {
            FileHashStatus.Stable => stored?.Sha256 is { } known && result.Sha256 is { } fresh && known.AsSpan().SequenceEqual(fresh)
                ? HashVerdict.Unchanged
                : HashVerdict.ContentChanged,
            FileHashStatus.Unstable => HashVerdict.Retry,
            FileHashStatus.Missing => HashVerdict.Vanished,
            _ => HashVerdict.Unreadable,
        };
    }
}
