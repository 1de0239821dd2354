namespace IndexKeeper.Service.WorkQueue;

/// <summary>Where a job stands (column <c>jobs.state</c>). Stored numbers: never change.</summary>
internal enum JobState
{
    /// <summary>Published, not claimed (or its lease expired: claimable again).</summary>
    Waiting = 0,

    /// <summary>A worker holds it until its lease ends.</summary>
    Claimed = 1,

    /// <summary>A worker handed back a vector set; the coordinator commits it and deletes the row.</summary>
    Done = 2,

    /// <summary>A worker gave it back without vectors (<see cref="JobFailure"/>); the coordinator decides and deletes the row.</summary>
    Failed = 3,
}
