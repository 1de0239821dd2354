namespace IndexKeeper.Service.Configuration;

/// <summary>How files are noticed.</summary>
public sealed class DetectOptions
{
    /// <summary>
    /// A file is read only after it has been quiet this long (copies onto shared drives arrive in pieces).
    /// A scan waits at most this long once, at its end, for files that were still being written.
    /// </summary>
    public double SettleSeconds { get; set; } = 2;

    /// <summary>The daemon walks every root this often, catching whatever notifications missed.</summary>
    public double FullWalkMinutes { get; set; } = 60;

    /// <summary>
    /// How often the daemon walks a root that lies on a network share (NFS, SMB, …; <c>MountTable</c>), unless
    /// the root sets its own <c>PollMinutes</c>: the server does not notify a client of changes other clients
    /// make, so between walks such changes are not seen.
    /// </summary>
    public double NetworkPollMinutes { get; set; } = 5;

    /// <summary>Size of each root watcher's notification buffer; an overflow falls back to a full walk.</summary>
    public int WatcherBufferKilobytes { get; set; } = 64;

    /// <summary>
    /// Bound on changed paths waiting to settle per root; past it the root's pending paths are dropped and
    /// one full walk of the root is done instead (like a notification buffer overflow).
    /// </summary>
    public int MaxPendingPaths { get; set; } = 50_000;

    /// <summary>A root that vanished (an unmounted share) keeps its documents this long before they are removed.</summary>
    public double RootGoneGraceHours { get; set; } = 72;
}
