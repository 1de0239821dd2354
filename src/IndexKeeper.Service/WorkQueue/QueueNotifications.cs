namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// The work queue's LISTEN/NOTIFY channels (docs/work-queue.md, "Notifications", whose version matches
/// <see cref="Version"/>). A notification only wakes a process sooner: every listener still looks by itself
/// every <see cref="SlowPoll"/>, so a lost one (a dropped connection, a build listening on another version's
/// channel) delays work, never stalls it.
/// </summary>
internal static class QueueNotifications
{
    /// <summary>The notification contract's version; it is part of each channel's name. Never reuse a number.</summary>
    public const int Version = 1;

    /// <summary>Jobs became claimable (published, or given back by a worker that stopped); payload: their encoder id. Workers listen.</summary>
    public const string JobsChannel = "indexkeeper_queue_jobs_v1";

    /// <summary>Jobs were handed back (done or failed); payload: their encoder id. The coordinator listens.</summary>
    public const string ResultsChannel = "indexkeeper_queue_results_v1";

    /// <summary>How often a listener looks by itself: the fallback for a notification that never came.</summary>
    public static readonly TimeSpan SlowPoll = TimeSpan.FromSeconds(5);
}
