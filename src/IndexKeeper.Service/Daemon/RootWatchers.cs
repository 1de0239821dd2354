using IndexKeeper.Core.Detect;
using Microsoft.Extensions.Logging;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// One file-system watcher per root feeding a <see cref="ChangeDebouncer"/>. A buffer overflow, a watcher
/// error or a root that vanishes and comes back turns into a full walk of that root; a lost watcher is
/// re-created when its root is there again. Roots are checked, never assumed: a root that is gone is
/// reported and its documents are kept (the work loop decides when its grace time is over).
/// </summary>
/// <remarks>Watcher callbacks run on thread-pool threads; the debouncer is used only under <c>gate</c>.</remarks>
internal sealed class RootWatchers : IDisposable
{
    private readonly IReadOnlyList<RootSpec> roots;
    private readonly int bufferBytes;
    private readonly TimeSpan forgetAfter;
    private readonly DaemonState state;
    private readonly ILogger log;
    private readonly ChangeDebouncer debouncer;
    private readonly object gate = new();
    private readonly Dictionary<string, FileSystemWatcher> watchers = new(StringComparer.Ordinal);
    private readonly AutoResetEvent wake = new(false);
    private readonly Dictionary<string, DateTimeOffset> nextWatchAttempt = new(StringComparer.Ordinal);

    public RootWatchers(IReadOnlyList<RootSpec> roots, TimeSpan settle, int maxPending, int bufferBytes, TimeSpan forgetAfter, DaemonState state, ILogger log)
    {
        this.roots = roots;
        this.bufferBytes = bufferBytes;
        this.forgetAfter = forgetAfter;
        this.state = state;
        this.log = log;
        debouncer = new ChangeDebouncer(settle, maxPending);
        foreach (var root in roots)
        {
            state.SetRoot(new RootState(root.Name, root.Path, false, null, null));
        }
    }

    /// <summary>Released whenever a notification arrives, so the work loop wakes before its tick.</summary>
    public WaitHandle Wake => wake;

    /// <summary>
    /// Looks at every root: starts watchers for roots that are there, reports roots that are gone (dropping
    /// their watcher), and asks for a full walk of a root that came back or whose watcher was re-created.
    /// Returns the roots whose grace time ran out while gone.
    /// </summary>
    public IReadOnlyList<string> CheckRoots()
    {
        var now = state.Clock.GetUtcNow();
        var expired = new List<string>();
        foreach (var root in roots)
        {
            var previous = state.Root(root.Name)!;
            if (!Directory.Exists(root.Path))
            {
                StopWatching(root.Name);
                var since = previous.MissingSinceUtc ?? now;
                if (previous.MissingSinceUtc is null)
                {
                    log.LogWarning("Root {Root} ({Path}) is gone; its documents are kept until {ForgetAt:O} unless it comes back.", root.Name, root.Path, since + forgetAfter);
                }

                state.SetRoot(previous with { Watching = false, MissingSinceUtc = since, ForgetAtUtc = since + forgetAfter });
                if (now >= since + forgetAfter)
                {
                    expired.Add(root.Name);
                }

                continue;
            }

            if (previous.MissingSinceUtc is not null)
            {
                log.LogInformation("Root {Root} is back; walking it.", root.Name);
                RequestWalk(root.Name);
            }

            var watching = previous.Watching || (now >= nextWatchAttempt.GetValueOrDefault(root.Name) && StartWatching(root));
            if (!watching)
            {
                nextWatchAttempt[root.Name] = now + TimeSpan.FromSeconds(30);
            }
            else if (!previous.Watching && previous.MissingSinceUtc is null && nextWatchAttempt.ContainsKey(root.Name))
            {
                // Notifications were lost while it was not watched.
                RequestWalk(root.Name);
            }
            state.SetRoot(previous with { Watching = watching, MissingSinceUtc = null, ForgetAtUtc = null });
        }

        return expired;
    }

    public void RequestWalk(string root)
    {
        lock (gate)
        {
            debouncer.RequestWalk(root);
        }

        wake.Set();
    }

    /// <summary>Puts paths back to settle again (a scan found them still changing).</summary>
    public void NoteAgain(IEnumerable<ChangedPath> paths)
    {
        lock (gate)
        {
            foreach (var path in paths)
            {
                debouncer.Note(path, state.Clock.GetUtcNow().UtcDateTime);
            }
        }
    }

    /// <summary>Roots that need a full walk and paths that settled, each handed out once.</summary>
    public (IReadOnlyList<string> Walks, IReadOnlyList<ChangedPath> Settled, DateTime? NextSettle) Take(DateTime nowUtc)
    {
        lock (gate)
        {
            var walks = debouncer.TakeWalks();
            var settled = debouncer.TakeSettled(nowUtc);
            return (walks, settled, debouncer.NextSettle());
        }
    }

    public void Dispose()
    {
        lock (gate)
        {
            foreach (var watcher in watchers.Values)
            {
                watcher.Dispose();
            }

            watchers.Clear();
        }

        wake.Dispose();
    }

    private bool StartWatching(RootSpec root)
    {
        try
        {
            var watcher = new FileSystemWatcher(root.Path)
            {
                IncludeSubdirectories = true,
                InternalBufferSize = bufferBytes,
                NotifyFilter = NotifyFilters.FileName | NotifyFilters.DirectoryName | NotifyFilters.LastWrite | NotifyFilters.Size | NotifyFilters.CreationTime,
            };
            watcher.Created += (_, e) => Note(root, e.FullPath);
            watcher.Changed += (_, e) => Note(root, e.FullPath);
            watcher.Deleted += (_, e) => Note(root, e.FullPath);
            watcher.Renamed += (_, e) =>
            {
                Note(root, e.OldFullPath);
                Note(root, e.FullPath);
            };
            watcher.Error += (_, e) => OnError(root, e.GetException());
            watcher.EnableRaisingEvents = true;
            lock (gate)
            {
                watchers[root.Name] = watcher;
            }

            return true;
        }
        catch (Exception ex) when (ex is IOException or ArgumentException or UnauthorizedAccessException or PlatformNotSupportedException)
        {
            // Full walks still catch changes; the next check tries again.
            log.LogWarning("Cannot watch root {Root}: {Message}; full walks only until it can be watched.", root.Name, ex.Message);
            return false;
        }
    }

    private void StopWatching(string root)
    {
        lock (gate)
        {
            if (watchers.Remove(root, out var watcher))
            {
                watcher.Dispose();
            }
        }
    }

    private void Note(RootSpec root, string fullPath)
    {
        var relative = Path.GetRelativePath(root.Path, fullPath);
        if (relative == "." || relative.StartsWith("..", StringComparison.Ordinal) || Path.IsPathRooted(relative))
        {
            return;
        }

        bool kept;
        lock (gate)
        {
            kept = debouncer.Note(new ChangedPath(root.Name, relative.Replace('\\', '/')), state.Clock.GetUtcNow().UtcDateTime);
        }

        if (!kept)
        {
            state.CountOverflow();
            log.LogWarning("Too many changes waiting under root {Root}; a full walk of it follows.", root.Name);
        }

        wake.Set();
    }

    private void OnError(RootSpec root, Exception error)
    {
        if (error is InternalBufferOverflowException)
        {
            state.CountOverflow();
            log.LogWarning("Change notifications for root {Root} overflowed; a full walk of it follows.", root.Name);
        }
        else
        {
            // Network shares drop their notifications on disconnect: re-create the watcher at the next check.
            log.LogWarning("The watcher of root {Root} failed ({Message}); a full walk follows and the watcher is re-created.", root.Name, error.Message);
            StopWatching(root.Name);
            if (state.Root(root.Name) is { } current)
            {
                state.SetRoot(current with { Watching = false });
            }
        }

        RequestWalk(root.Name);
    }
}
