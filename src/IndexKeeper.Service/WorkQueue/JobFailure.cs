namespace IndexKeeper.Service.WorkQueue;

/// <summary>Why a worker gave a job back (column <c>jobs.failure_kind</c>). Stored numbers: never change.</summary>
internal enum JobFailure
{
    /// <summary>The file's hash or the page's key is no longer what was queued: the coordinator's next scan sees the change; never encoded stale.</summary>
    Changed = 1,

    /// <summary>The page could not be read or encoded: counts towards the page's quarantine, as a local failure does.</summary>
    Failed = 2,

    /// <summary>The worker has no path for the job's root (its Roots settings): another worker may.</summary>
    Unmapped = 3,
}
