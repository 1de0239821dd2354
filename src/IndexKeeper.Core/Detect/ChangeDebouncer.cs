namespace IndexKeeper.Core.Detect;

/// <summary>
/// Per-file debouncing of change notifications: a path is handed out once no notification has named it for
/// the settle time (copies onto shared drives arrive in pieces; the scan then checks that size and
/// modification time hold still). Bounded: when more than <c>maxPending</c> paths wait, the pending paths
/// of the root that overflowed are dropped and the root is handed out for a full walk instead — a soft
/// limit in place of unbounded memory. Pure (times are given); not thread-safe.
/// </summary>
public sealed class ChangeDebouncer
{
    private readonly TimeSpan settle;
    private readonly int maxPending;
    private readonly Dictionary<ChangedPath, DateTime> lastSeen = [];
    private readonly HashSet<string> walkRoots = new(StringComparer.Ordinal);

    public ChangeDebouncer(TimeSpan settle, int maxPending)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(settle, TimeSpan.Zero);
        ArgumentOutOfRangeException.ThrowIfLessThan(maxPending, 1);
        this.settle = settle;
        this.maxPending = maxPending;
    }

    /// <summary>Paths waiting to settle.</summary>
    public int Pending => lastSeen.Count;

    /// <summary>Records a notification; false when it overflowed the bound (the root then waits for a full walk).</summary>
    public bool Note(ChangedPath path, DateTime nowUtc)
    {
        ArgumentNullException.ThrowIfNull(path);
        if (walkRoots.Contains(path.Root))
        {
            // A full walk of the root is coming: it sees this path too.
            return true;
        }

        if (!lastSeen.ContainsKey(path) && lastSeen.Count >= maxPending)
        {
            RequestWalk(path.Root);
            return false;
        }

        lastSeen[path] = nowUtc;
        return true;
    }

    /// <summary>Asks for a full walk of a root (overflow, watcher error, root back); its pending paths are dropped.</summary>
    public void RequestWalk(string root)
    {
        walkRoots.Add(root);
        foreach (var path in lastSeen.Keys.Where(p => p.Root == root).ToList())
        {
            lastSeen.Remove(path);
        }
    }

    /// <summary>Roots waiting for a full walk, handed out once.</summary>
    public IReadOnlyList<string> TakeWalks()
    {
        var roots = walkRoots.Order(StringComparer.Ordinal).ToList();
        walkRoots.Clear();
        return roots;
    }

    /// <summary>Paths quiet for the settle time, handed out once, in path order.</summary>
    public IReadOnlyList<ChangedPath> TakeSettled(DateTime nowUtc)
    {
        var due = lastSeen.Where(p => nowUtc - p.Value >= settle).Select(p => p.Key)
            .OrderBy(p => p.Root, StringComparer.Ordinal).ThenBy(p => p.RelativePath, StringComparer.Ordinal).ToList();
        foreach (var path in due)
        {
            lastSeen.Remove(path);
        }

        return due;
    }

    /// <summary>When the next pending path settles, or null when none waits.</summary>
    public DateTime? NextSettle() => lastSeen.Count == 0 ? null : lastSeen.Values.Min() + settle;
}
