namespace IndexKeeper.Service.WorkQueue;

/// <summary>What the coordinator does with a job a worker handed back (<see cref="ResultCheck"/>).</summary>
internal enum ResultVerdict
{
    /// <summary>Commit the vector set through the one writer's path.</summary>
    Commit,

    /// <summary>Nothing to commit and nothing wrong: the page has vectors already, or is no longer referenced, or its encoder is no longer active.</summary>
    Drop,

    /// <summary>The result breaks a promise (another encoder id, bad bytes, other dimensions): never committed; counted as a failed attempt of the page.</summary>
    Reject,

    /// <summary>The worker found the file or page changed, or had no path for the root: queued again after a back-off, not counted against the page.</summary>
    Defer,

    /// <summary>The worker could not read or encode the page: a failed attempt of the page, as locally.</summary>
    Failure,
}
